/**
 * The app's configuration, read from the environment and validated once at start-up: a missing or
 * malformed setting stops the app with a list of what is wrong, instead of failing later.
 */
import 'reflect-metadata';
import { plainToInstance, Type } from 'class-transformer';
import { IsIn, IsInt, IsNotEmpty, IsOptional, IsString, IsUrl, Max, Min, MinLength, validateSync } from 'class-validator';

/** Values that make a local demo work and must never reach production. */
export const LOCAL_ONLY = {
  CERTIFICATE_SECRET: 'ampwright-local-only-certificate-secret',
  /** The password `npm start` gives the local database user (scripts/lib/env.mjs). */
  DB_PASSWORD: 'ampwright-local-only',
  /** The S3 fake's fixed credentials. */
  S3_KEY: 'S3RVER',
} as const;

const LOOPBACK = /^(127\.\d+\.\d+\.\d+|::1|\[::1\]|localhost)$/i;
export const isLoopback = (host: string) => LOOPBACK.test(host.trim());

export class Environment {
  @IsIn(['development', 'production', 'test'])
  NODE_ENV: 'development' | 'production' | 'test' = 'development';

  @IsString()
  @IsNotEmpty()
  APP_HOST = '127.0.0.1';

  @Type(() => Number)
  @IsInt()
  @Min(1)
  @Max(65535)
  APP_PORT = 3000;

  @IsString()
  @IsNotEmpty()
  DB_HOST = '127.0.0.1';

  @Type(() => Number)
  @IsInt()
  @Min(1)
  @Max(65535)
  DB_PORT = 3307;

  /**
   * MariaDB's Unix socket, for a database on the same machine: when set, the app connects through it
   * instead of DB_HOST:DB_PORT (no TCP stack per query; `npm start` and `npm test` set it for their private instance).
   */
  @IsOptional()
  @IsString()
  @IsNotEmpty()
  DB_SOCKET?: string;

  @IsString()
  @IsNotEmpty()
  DB_NAME = 'ampwright';

  @IsString()
  @IsNotEmpty()
  DB_USER = 'ampwright';

  @IsString()
  @IsNotEmpty({ message: 'DB_PASSWORD must be set (npm start sets a local one)' })
  DB_PASSWORD: string;

  /**
   * Connections the app keeps open to MariaDB at most. Requests beyond it wait for one in the app, where a
   * short read queues behind a save; MariaDB's thread pool (thread_handling=pool-of-threads, which our
   * scripts set) runs the statements of many connections on a thread per core.
   */
  @Type(() => Number)
  @IsInt()
  @Min(1)
  @Max(200)
  DB_POOL_SIZE = 25;

  @IsString()
  @IsNotEmpty()
  SMTP_HOST = '127.0.0.1';

  @Type(() => Number)
  @IsInt()
  @Min(1)
  @Max(65535)
  SMTP_PORT = 1025;

  @IsString()
  @IsNotEmpty()
  MAIL_FROM = 'Ampwright <no-reply@ampwright.example>';

  @IsUrl({ require_tld: false, protocols: ['http', 'https'] })
  S3_ENDPOINT = 'http://127.0.0.1:4569';

  @IsString()
  @IsNotEmpty()
  S3_REGION = 'us-east-1';

  @IsString()
  @IsNotEmpty()
  S3_BUCKET = 'ampwright-files';

  @IsString()
  @IsNotEmpty()
  S3_ACCESS_KEY: string;

  @IsString()
  @IsNotEmpty()
  S3_SECRET_KEY: string;

  /** Where people reach the app, for links in e-mail. */
  @IsUrl({ require_tld: false, protocols: ['http', 'https'] })
  APP_URL = 'http://127.0.0.1:3000';

  /** bcrypt cost; 12 outside tests. */
  @Type(() => Number)
  @IsInt()
  @Min(4)
  @Max(15)
  BCRYPT_COST = 12;

  /** The longest a session lasts from sign-in, however busy. */
  @Type(() => Number)
  @IsInt()
  @Min(1)
  @Max(24 * 30)
  SESSION_HOURS = 12;

  /** A session unused for this long ends (each use moves its end on, up to SESSION_HOURS). */
  @Type(() => Number)
  @IsInt()
  @Min(5)
  @Max(24 * 60 * 30)
  SESSION_IDLE_MINUTES = 120;

  /** Set when the app is served over HTTPS, so the session cookie is only sent over it. */
  @IsIn(['true', 'false'])
  COOKIE_SECURE: 'true' | 'false' = 'false';

  /** Seals the firms' certificate passwords at rest (AES-256-GCM). Set a long random value in production. */
  @IsString()
  @IsNotEmpty()
  @MinLength(16, { message: 'CERTIFICATE_SECRET must be at least 16 characters' })
  CERTIFICATE_SECRET: string = LOCAL_ONLY.CERTIFICATE_SECRET;

  /** Whether this instance makes packages (a worker polling the job table); several may. */
  @IsIn(['true', 'false'])
  PACKAGE_WORKER: 'true' | 'false' = 'true';

  /**
   * Which proxies in front of the app to trust for the client's address (X-Forwarded-For), as Express's
   * "trust proxy": `loopback`, addresses or CIDR ranges separated by commas, or a number of hops.
   * Throttling counts by that address, so set it to the load balancers' addresses behind one.
   */
  @IsString()
  @IsNotEmpty()
  TRUST_PROXY = 'loopback';

  /** Path-style bucket addresses (http://host/bucket/key), as local fakes and MinIO need; `false` for virtual-hosted S3. */
  @IsIn(['true', 'false'])
  S3_FORCE_PATH_STYLE: 'true' | 'false' = 'true';

  /** Failed sign-ins a minute from one client address (good ones never count). */
  @Type(() => Number)
  @IsInt()
  @Min(1)
  @Max(100_000)
  THROTTLE_FAILED_SIGN_INS_PER_ADDRESS = 30;

  /**
   * Warm evaluation processes (sheets, CSV uploads and certificate files are worked through there). A firm may
   * run one fewer at once, so another always finds one free. Four on a 2-core machine: a one-cell edit takes a
   * process about 2 ms of CPU but, under load, tens of ms waiting for a core and for its answer to be read, so
   * three of one firm's edits in flight keep its saves moving (README, "Performance").
   */
  @Type(() => Number)
  @IsInt()
  @Min(2)
  @Max(64)
  EVALUATION_PROCESSES = 4;

  /** The longest one evaluation may run, in ms. */
  @Type(() => Number)
  @IsInt()
  @Min(100)
  @Max(60_000)
  EVALUATION_TIMEOUT_MS = 2000;

  /** The longest an evaluation may wait for a free process, in ms (the deadline counts the wait). */
  @Type(() => Number)
  @IsInt()
  @Min(100)
  @Max(60_000)
  EVALUATION_WAIT_MS = 3000;

  /** Each evaluation process's heap cap in MB; its resident memory may reach twice this. */
  @Type(() => Number)
  @IsInt()
  @Min(64)
  @Max(8192)
  EVALUATION_MEMORY_MB = 256;

  /** Evaluations one firm may have running or waiting; more are answered 429. */
  @Type(() => Number)
  @IsInt()
  @Min(1)
  @Max(1000)
  EVALUATION_QUEUE_PER_FIRM = 32;

  /** The built front end to serve; empty serves the API only. */
  @IsOptional()
  @IsString()
  STATIC_DIR?: string;

  /** The sheet templates' folder (the repository's templates/ by default). */
  @IsOptional()
  @IsString()
  TEMPLATES_DIR?: string;

  /** One log line per request; `false` turns it off (the load script does, so logging does not skew its figures). */
  @IsIn(['true', 'false'])
  LOG_REQUESTS: 'true' | 'false' = 'true';

  /** A bearer token for GET /api/metrics; without one, the metrics answer only to this machine (loopback). */
  @IsOptional()
  @IsString()
  @MinLength(16)
  METRICS_TOKEN?: string;

  /** `json` (one object a line, with the request id: for operators and collectors) or `text` (coloured, for a terminal). */
  @IsIn(['json', 'text'])
  LOG_FORMAT: 'json' | 'text' = 'json';

  /** Requests a minute from one client address, on every route. */
  @Type(() => Number)
  @IsInt()
  @Min(1)
  @Max(10_000_000)
  THROTTLE_DEFAULT_PER_ADDRESS = 600;

  /** Sign-in, registration, reset and invitation requests a minute from one client address. */
  @Type(() => Number)
  @IsInt()
  @Min(1)
  @Max(10_000_000)
  THROTTLE_AUTH_PER_ADDRESS = 5;

  /** Uploads to the public verification page a minute from one client address. */
  @Type(() => Number)
  @IsInt()
  @Min(1)
  @Max(10_000_000)
  THROTTLE_VERIFY_PER_ADDRESS = 10;
}

/**
 * What a production instance must not run with: the built-in secrets of the local demo, and session
 * cookies sent over plain HTTP to an address other than this machine. Each line says what to set.
 */
export function insecureProductionSettings(env: Environment): string[] {
  const problems: string[] = [];
  if (env.CERTIFICATE_SECRET === LOCAL_ONLY.CERTIFICATE_SECRET || env.CERTIFICATE_SECRET.length < 32) {
    problems.push(
      'CERTIFICATE_SECRET is the built-in local value or shorter than 32 characters: set a long random value (for example `openssl rand -base64 48`), the same on every instance',
    );
  }
  if (env.DB_PASSWORD === LOCAL_ONLY.DB_PASSWORD) problems.push('DB_PASSWORD is the local demo password: set the password of the production database user');
  if (env.S3_ACCESS_KEY === LOCAL_ONLY.S3_KEY || env.S3_SECRET_KEY === LOCAL_ONLY.S3_KEY)
    problems.push("S3_ACCESS_KEY and S3_SECRET_KEY are the local fake's: set the object store's credentials");
  let appUrlHost = '';
  try {
    appUrlHost = new URL(env.APP_URL).hostname;
  } catch {
    /* reported by the validation above */
  }
  if (env.COOKIE_SECURE !== 'true' && (!isLoopback(env.APP_HOST) || !isLoopback(appUrlHost))) {
    problems.push(
      `COOKIE_SECURE is false while the app is reached at ${isLoopback(env.APP_HOST) ? env.APP_URL : env.APP_HOST}: serve it over HTTPS and set COOKIE_SECURE=true`,
    );
  }
  return problems;
}

let loaded: Environment | undefined;

/**
 * This process's validated configuration, for what runs outside Nest's injection (the entry point, and
 * throttle limits, resolved on the first request). Inside Nest, inject `ConfigService<Environment, true>`.
 */
export function environment(): Environment {
  return (loaded ??= validateEnvironment(process.env));
}

export function validateEnvironment(raw: Record<string, unknown>): Environment {
  const env = plainToInstance(Environment, raw, { enableImplicitConversion: false, exposeDefaultValues: true });
  const errors = validateSync(env, { skipMissingProperties: false, whitelist: false });
  if (errors.length > 0) {
    const lines = errors.flatMap((e) => Object.values(e.constraints ?? {}).map((m) => `  - ${m}`));
    throw new Error(`The configuration is not valid:\n${lines.join('\n')}`);
  }
  if (env.NODE_ENV === 'production') {
    const problems = insecureProductionSettings(env);
    if (problems.length)
      throw new Error(`Ampwright will not start in production with local-only settings. Set:\n${problems.map((p) => `  - ${p}`).join('\n')}`);
  }
  return env;
}
