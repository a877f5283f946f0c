/** A message caught by the local SMTP catcher (demo and tests only). */
export interface CapturedMail {
  id: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string | null;
  receivedAt: string;
}

export interface HealthStatus {
  status: 'ok' | 'degraded';
  database: 'ok' | 'unreachable';
}

/** Error body returned by every route. */
export interface ApiError {
  statusCode: number;
  error: string;
  message: string | string[];
}
