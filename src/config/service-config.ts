/**
 * How Forelight runs as a service (YAML `calibration`, `schedule`, `delivery`): the hindcast set it calibrates
 * on, when it runs, and how bulletins leave. Part of `Config` (types.ts).
 */

export interface SmtpConfig {
  readonly host: string;
  readonly port: number;
  /** "tls" = implicit TLS (465), "starttls" = upgrade, "none" = plain (loopback/testing). */
  readonly security: 'tls' | 'starttls' | 'none';
  readonly user?: string;
  /** Name of the environment variable holding the password; never the password itself. */
  readonly passwordEnv?: string;
  readonly timeoutSeconds: number;
}

export interface DeliveryConfig {
  readonly from: string;
  readonly smtp: SmtpConfig | null;
  readonly outbox: string;
  readonly archive: string;
  readonly operators: readonly string[];
  readonly retries: number;
  readonly retryBaseSeconds: number;
  /** Chromium used to print each bulletin to PDF (`pdf-chromium`); null or absent: bulletins go without PDF. */
  readonly pdfChromium?: string | null;
}

export interface ScheduleConfig {
  /** Classic cron expression (5 or 6 fields; day of month OR day of week), read by croner (src/core/next-runs.ts). */
  readonly cron: string;
  /** IANA time zone. */
  readonly timezone: string;
  /** Minutes to wait for the new forecast files after the scheduled time. */
  readonly waitForDataMinutes: number;
  readonly pollSeconds: number;
}

export interface CalibrationConfig {
  /** Days either side of the start day-of-year whose hindcast starts count (when several starts exist). */
  readonly windowDays: number;
  readonly minHindcastYears: number;
  /** Minimum members for a probability to be stated to 10 %. */
  readonly minMembers: number;
  readonly cacheDir: string;
}
