/**
 * Nunjucks environments for bulletins. One set of templates serves every language (`templates/*.njk`); every
 * sentence comes from the message catalogue through the `t(key, args)` function each render receives.
 * Templates resolve from the operator's `config.templates` directory first, then from the shipped `templates/`
 * of this package, so an operator can copy and override any single file (and any single message).
 *
 * Two environments, each with its own loader: `html` autoescapes (region and team names from YAML can never
 * inject markup); `text` does not, because plain-text parts and mail subjects are not HTML and `&` must stay `&`.
 * Both throw on undefined variables so a template typo fails the run instead of printing an empty gap.
 */
import { existsSync } from 'node:fs';
import nunjucks from 'nunjucks';
import { packagePath } from '../core/package-root.ts';
import { ForelightError } from '../core/errors.ts';
import { loadCatalogue, type Catalogue, type Translate } from './catalogue.ts';
import { applyTypography, applyTypographyHtml } from './typography.ts';

/** Absolute path of the shipped templates. */
export const SHIPPED_TEMPLATES = `${packagePath('templates')}/`;

export interface TemplateEnv {
  readonly catalogue: Catalogue;
  /** Translator of one locale (subjects, CAP fields, chart labels). */
  t(locale: string): Translate;
  /** Render one template file for a locale; `.html.njk` files autoescape, others do not. `ctx` in templates is `context`. */
  render(name: string, locale: string, context: object): string;
}

/** Build the environments; `overrideDir` is `config.templates` (skipped when empty or absent). */
export function createTemplateEnv(overrideDir: string): TemplateEnv {
  const useOverride = Boolean(overrideDir) && existsSync(overrideDir);
  const searchPaths = useOverride ? [overrideDir, SHIPPED_TEMPLATES] : [SHIPPED_TEMPLATES];
  // One loader per environment: nunjucks caches compiled templates on the loader, bound to the environment
  // that compiled them, so a shared loader could hand an autoescaping template to the text side or vice versa.
  const loader = (): nunjucks.FileSystemLoader => new nunjucks.FileSystemLoader(searchPaths, { noCache: false });
  const options = { throwOnUndefined: true, trimBlocks: true, lstripBlocks: true };
  const html = new nunjucks.Environment(loader(), { ...options, autoescape: true });
  const text = new nunjucks.Environment(loader(), { ...options, autoescape: false });
  const catalogue = loadCatalogue(useOverride ? overrideDir : '');
  const render = (name: string, locale: string, context: object): string => {
    const t = catalogue.forLocale(locale);
    try {
      const isHtml = name.endsWith('.html.njk');
      const out = (isHtml ? html : text).render(name, { ...context, ctx: context, locale, t });
      // Labels such as "When:" are joined in templates; the locale's spacing applies to the whole result.
      return isHtml ? applyTypographyHtml(locale, out) : applyTypography(locale, out);
    } catch (err) {
      if (err instanceof ForelightError) throw err;
      const inner = err instanceof Error ? err.cause : undefined;
      if (inner instanceof ForelightError) throw inner;
      throw new ForelightError(
        'render',
        'template',
        `template ${name} (searched ${searchPaths.join(', ')}) failed: ${oneLine(err)}`,
        'fix the template or remove the override to use the shipped one',
        { cause: err },
      );
    }
  };
  return { catalogue, t: (locale) => catalogue.forLocale(locale), render };
}

function oneLine(err: unknown): string {
  return (err instanceof Error ? err.message : String(err)).replace(/\s+/g, ' ').trim();
}
