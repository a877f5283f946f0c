/**
 * The validated configuration of one server process. Built once by `loadConfig` and injected
 * everywhere else by this class token; nothing outside src/config reads process.env.
 */
export abstract class AppConfig {
  abstract readonly port: number;
  abstract readonly host: string;
  abstract readonly databaseUrl: string;
  /** Absolute directory for everything the server writes (secret, mail, uploads). */
  abstract readonly storageDir: string;
  abstract readonly jwtSecret: string;
  /** Access-token lifetime in seconds. */
  abstract readonly jwtExpiresIn: number;
  abstract readonly smtpUrl: string;
  abstract readonly mailFrom: string;
  /** Public base URL of the web app, without a trailing slash; e-mail links start with it. */
  abstract readonly appUrl: string;
  abstract readonly demoPassword: string;
  abstract readonly mailCatcherDir: string;
  abstract readonly mailCatcherPort: number;
  /** Sign-in and reset requests allowed per minute for one address and e-mail. */
  abstract readonly throttleLoginLimit: number;
  /** Built single-page app to serve; ignored when the directory does not exist. */
  abstract readonly frontendDir: string;
}
