import express, { type NextFunction, type Request, type RequestHandler, type Response, type Router } from 'express';
import type { z } from 'zod';
import { AppError } from './app-error';
import { enforce, type Member, type Policy } from './policy';
import { uploadOne } from './upload';
import { parseOrThrow } from './validate';

type Method = 'get' | 'post' | 'patch' | 'put' | 'delete';

/** A multipart route: one file in the field "file", and text fields read by a schema. */
export interface UploadSpec<F extends z.ZodType = z.ZodType> {
  /** The text fields beside the file (strings, as multipart sends them). */
  fields: F;
  /** What the file is, for the error when it is missing: "the image", "the photo". */
  file: string;
}

/** What a route declares: who may call it, what it does, and the shape of what it reads. */
export interface RouteOptions {
  policy: Policy;
  summary: string;
  /** A JSON body; unknown keys are refused when the schema is strict. */
  body?: z.ZodType;
  /** Query parameters (strings); keys the schema does not name are dropped. */
  query?: z.ZodType;
  /** A multipart body instead of JSON. */
  upload?: UploadSpec;
  /** Status of a successful answer. */
  status?: number;
}

/** One documented /api route: what the OpenAPI document and the policy walk are built from. */
export interface RouteSpec extends RouteOptions {
  method: Method;
  /** Full path in Express syntax, e.g. /api/studios/:studioId. */
  path: string;
  tag: string;
}

type Parsed<S> = S extends z.ZodType ? z.output<S> : undefined;

/**
 * The request a handler sees, typed by its route's options: the parsed body, query and upload
 * fields, the user (always there unless the route is public) and the studio membership (there
 * under a studio policy).
 */
export type RouteRequest<O extends RouteOptions> = Omit<Request, 'body' | 'query' | 'user' | 'membership' | 'file'> & {
  body: O['upload'] extends UploadSpec ? z.output<O['upload']['fields']> : Parsed<O['body']>;
  /** Without a schema, the raw query string: a route that reads it should declare one. */
  query: O['query'] extends z.ZodType ? z.output<O['query']> : Request['query'];
  user: O['policy'] extends { kind: 'public' } ? Express.User | undefined : Express.User;
  membership: O['policy'] extends { kind: 'studio' } ? Member : undefined;
  file: O['upload'] extends UploadSpec ? Express.Multer.File : undefined;
};

/** A route's handler; what it throws (or rejects with) goes to the error handler. */
export type RouteHandler<O extends RouteOptions> = (req: RouteRequest<O>, res: Response, next: NextFunction) => unknown;

/** The caller of a studio route: who, and in which studio with which role. */
export type StudioCaller = { user: Express.User; membership: Member };

/** Parses the query string with the route's schema; Express 5 keeps req.query a getter, so the parsed value shadows it. */
const parseQuery =
  (schema: z.ZodType): RequestHandler =>
  (req, _res, next) => {
    Object.defineProperty(req, 'query', { value: parseOrThrow(schema, req.query, 'query string'), writable: true, enumerable: true });
    next();
  };

const parseUpload =
  ({ fields, file }: UploadSpec): RequestHandler =>
  (req, _res, next) => {
    req.body = parseOrThrow(fields, req.body ?? {}, 'upload fields');
    if (!req.file) throw new AppError(400, 'invalid_input', `Attach ${file} as the multipart field "file".`);
    next();
  };

const parseBody =
  (schema: z.ZodType): RequestHandler =>
  (req, _res, next) => {
    req.body = parseOrThrow(schema, req.body ?? {});
    next();
  };

/**
 * An Express router whose every route must state its policy and summary. The policy runs
 * first, then the query, upload and body schemas, then the handler, which gets the parsed
 * values with their types.
 */
export class ApiRouter {
  readonly router: Router = express.Router({ mergeParams: true });
  readonly specs: RouteSpec[] = [];

  constructor(
    /** Mount path below /api, e.g. /studios. */
    readonly mount: string,
    readonly tag: string,
  ) {}

  route<const O extends RouteOptions>(method: Method, path: string, options: O, handler: RouteHandler<O>): this {
    const chain: RequestHandler[] = [enforce(options.policy)];
    if (options.query) chain.push(parseQuery(options.query));
    if (options.upload) chain.push(uploadOne, parseUpload(options.upload));
    if (options.body) chain.push(parseBody(options.body));
    // The one place the typed request meets Express's: the chain above made it so.
    this.router[method](path, ...chain, handler as unknown as RequestHandler);
    const full = `/api${this.mount}${path === '/' ? '' : path}`;
    this.specs.push({ method, path: full, tag: this.tag, ...options });
    return this;
  }
}
