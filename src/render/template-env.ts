/**
 * Nunjucks environments for bulletins. Templates resolve from the operator's `config.templates` directory first,
 * then from the shipped `templates/` of this package, so an operator can copy and override any single file.
 *
 * Two environments, each with its own loader: `html` autoescapes (region and team names from YAML can never inject markup);
 * `text` does not, because plain-text parts and mail subjects are not HTML and `&` must stay `&`. Both throw on
 * undefined variables so a template typo fails the run instead of printing an empty gap. Compiled templates are
 * cached for the life of one environment (one run), so edits take effect on the next run.
 */
import { existsSync } from 'node:fs';
import nunjucks from 'nunjucks';
import { packagePath } from '../core/package-root.ts';
import { ForelightError } from '../core/errors.ts';

/** Absolute path of the shipped templates. */
export const SHIPPED_TEMPLATES = `${packagePath('templates')}/`;

export interface TemplateEnv {
  readonly html: nunjucks.Environment;
  readonly text: nunjucks.Environment;
  /** Render one template file (e.g. `en/team.html.njk`); `.html.njk` files autoescape, others do not. */
  render(name: string, context: object): string;
  /** Call a macro of `<locale>/phrases.njk` in plain text (for subjects, CAP fields and chart labels). */
  phrase(locale: string, macro: string, args: object): string;
}

/** Build the environments; `overrideDir` is `config.templates` (skipped when empty or absent). */
export function createTemplateEnv(overrideDir: string): TemplateEnv {
  const searchPaths = overrideDir && existsSync(overrideDir) ? [overrideDir, SHIPPED_TEMPLATES] : [SHIPPED_TEMPLATES];
  // One loader per environment: nunjucks caches compiled templates on the loader, bound to the environment
  // that compiled them, so a shared loader could hand an autoescaping template to the text side or vice versa.
  const loader = (): nunjucks.FileSystemLoader => new nunjucks.FileSystemLoader(searchPaths, { noCache: false });
  const options = { throwOnUndefined: true, trimBlocks: true, lstripBlocks: true };
  const html = new nunjucks.Environment(loader(), { ...options, autoescape: true });
  const text = new nunjucks.Environment(loader(), { ...options, autoescape: false });
  const render = (name: string, context: object): string => {
    try {
      return (name.endsWith('.html.njk') ? html : text).render(name, context);
    } catch (err) {
      throw new ForelightError('render', 'template', `template ${name} (searched ${searchPaths.join(', ')}) failed: ${oneLine(err)}`, 'fix the template or remove the override to use the shipped one', { cause: err });
    }
  };
  const phrase = (locale: string, macro: string, args: object): string => {
    const source = `{% import "${locale}/phrases.njk" as p %}{{ p.${macro}(a) }}`;
    try {
      return text.renderString(source, { a: args }).trim();
    } catch (err) {
      throw new ForelightError('render', 'template', `phrase ${macro} of ${locale}/phrases.njk failed: ${oneLine(err)}`, `add the macro to templates/${locale}/phrases.njk`, { cause: err });
    }
  };
  return { html, text, render, phrase };
}

function oneLine(err: unknown): string {
  return (err instanceof Error ? err.message : String(err)).replace(/\s+/g, ' ').trim();
}
