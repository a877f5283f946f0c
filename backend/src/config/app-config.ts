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
  /** Largest accepted upload, in bytes. */
  abstract readonly uploadMaxBytes: number;
  /** Where recordings are kept: under STORAGE_DIR/objects, or in an S3-compatible bucket. */
  abstract readonly storageDriver: StorageDriverName;
  /** Set when storageDriver is 's3'. */
  abstract readonly s3: S3Settings | null;
  /** Lifetime of signed media links, in seconds. */
  abstract readonly mediaUrlTtlSeconds: number;
  /** Run the recording-processing worker inside this process. */
  abstract readonly worker: boolean;
  abstract readonly ffmpegPath: string;
  abstract readonly ffprobePath: string;
  /** Generated demo videos for the seed to ingest, or null. */
  abstract readonly demoVideosDir: string | null;
}

export type StorageDriverName = 'local' | 's3';

export interface S3Settings {
  bucket: string;
  /** Endpoint of an S3-compatible service; undefined means AWS itself. */
  endpoint: string | undefined;
  region: string;
  /** Both undefined: the SDK's default credential chain (environment, instance role). */
  accessKeyId: string | undefined;
  secretAccessKey: string | undefined;
  /** bucket in the path (http://host/bucket/key), as most self-hosted stores need. */
  forcePathStyle: boolean;
}
