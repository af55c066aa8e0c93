/**
 * Process exit codes of `forelight run` / the service, for systemd and cron wrappers. Higher = worse is NOT
 * implied; each code names one situation an operator handles differently.
 */
export const EXIT = {
  /** Bulletins issued and every delivery sent (or written to the outbox with `smtp: null`). */
  ok: 0,
  /** Unexpected failure (bug, ledger unreadable): read the log. */
  unexpected: 1,
  /** Configuration invalid: fix the YAML lines named in the message. */
  configInvalid: 2,
  /** Issued, but some inputs were missing or late (older forecast used, or a source left out). */
  inputProblem: 3,
  /**
   * Some outputs failed: deliveries (copies in the outbox, operators told), or the archive or status file could not
   * be written (named on stderr and in the operator notice; the e-mails went out regardless).
   */
  deliveryFailed: 4,
  /** No new forecast data: nothing issued, operators told (not an error). */
  nothingNew: 5,
  /** Another Forelight run holds the lock, or this forecast was already issued by a live process. */
  locked: 6,
  /**
   * Issued and delivered, but the consistency check found statements of a bulletin that disagree: a bug in
   * Forelight, not an input problem (report it with run.json; the bulletins went out as rendered, operators told).
   */
  contradiction: 7,
  /** Stopped by SIGTERM/SIGINT before issuing: nothing issued, the next start runs the slot (128 + SIGTERM, shell convention). */
  stopped: 143,
  /** Command line not understood (EX_USAGE of BSD sysexits.h). */
  usage: 64,
} as const;

export type ExitCode = (typeof EXIT)[keyof typeof EXIT];

/** Name of an exit code for logs and the status file. */
export function exitCodeName(code: number): string {
  const entry = Object.entries(EXIT).find(([, v]) => v === code);
  return entry ? entry[0] : `unknown(${code})`;
}

/**
 * Exit code after delivery: `deliveryFailed` when any recipient was rejected, is still pending, or (with SMTP
 * configured) ended in the outbox; with `smtp: null` the outbox IS the delivery, so it counts as ok.
 */
export function exitCodeForDeliveries(
  counts: { readonly failed: number; readonly outbox: number; readonly pending: number },
  smtpConfigured: boolean,
): ExitCode {
  return counts.failed > 0 || counts.pending > 0 || (smtpConfigured && counts.outbox > 0) ? EXIT.deliveryFailed : EXIT.ok;
}
