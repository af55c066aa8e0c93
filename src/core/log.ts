/**
 * Structured JSON logs, one object per line on stderr (or a given sink). Children add fields such as
 * `runId` and `stage`. Values under keys that look secret (password, pass, auth, token) are redacted.
 */

const LEVELS = ['debug', 'info', 'warn', 'error'] as const;
export type Level = (typeof LEVELS)[number];

/** The level a name such as FORELIGHT_LOG_LEVEL's value names, or undefined for any other text. */
export const levelNamed = (name: string | undefined): Level | undefined => LEVELS.find((l) => l === name);

export interface Logger {
  debug(msg: string, fields?: Record<string, unknown>): void;
  info(msg: string, fields?: Record<string, unknown>): void;
  warn(msg: string, fields?: Record<string, unknown>): void;
  error(msg: string, fields?: Record<string, unknown>): void;
  child(fields: Record<string, unknown>): Logger;
}

const ORDER: Record<Level, number> = { debug: 10, info: 20, warn: 30, error: 40 };
const SECRET_KEY = /pass(word)?|auth|token|secret/i;

function redact(fields: Record<string, unknown>): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(fields)) out[k] = SECRET_KEY.test(k) ? '[redacted]' : v;
  return out;
}

export function createLogger(options: { level?: Level; sink?: (line: string) => void; base?: Record<string, unknown> } = {}): Logger {
  const min = ORDER[options.level ?? levelNamed(process.env.FORELIGHT_LOG_LEVEL) ?? 'info'];
  const sink = options.sink ?? ((line: string) => process.stderr.write(line + '\n'));
  const base = options.base ?? {};
  const emit = (level: Level, msg: string, fields?: Record<string, unknown>) => {
    if (ORDER[level] < min) return;
    sink(JSON.stringify({ time: new Date().toISOString(), level, msg, ...redact(base), ...redact(fields ?? {}) }));
  };
  return {
    debug: (m, f) => emit('debug', m, f),
    info: (m, f) => emit('info', m, f),
    warn: (m, f) => emit('warn', m, f),
    error: (m, f) => emit('error', m, f),
    child: (fields) => createLogger({ level: options.level, sink, base: { ...base, ...fields } }),
  };
}

/** A logger that drops everything (for pure tests). */
export const silentLogger: Logger = createLogger({ sink: () => {} });
