import express, { type RequestHandler, type Router } from 'express';
import type { z } from 'zod';
import { enforce, type Policy } from './policy';
import { validateBody } from './validate';

type Method = 'get' | 'post' | 'patch' | 'put' | 'delete';

/** One documented /api route: what the OpenAPI document and the policy walk are built from. */
export interface RouteSpec {
  method: Method;
  /** Full path in Express syntax, e.g. /api/studios/:studioId. */
  path: string;
  policy: Policy;
  summary: string;
  tag: string;
  body?: z.ZodType;
  /** Status of a successful answer. */
  status?: number;
}

interface RouteOptions {
  policy: Policy;
  summary: string;
  body?: z.ZodType;
  status?: number;
}

/**
 * An Express router whose every route must state its policy and summary. The policy runs
 * first, then the body schema, then the handlers.
 */
export class ApiRouter {
  readonly router: Router = express.Router({ mergeParams: true });
  readonly specs: RouteSpec[] = [];

  constructor(
    /** Mount path below /api, e.g. /studios. */
    readonly mount: string,
    readonly tag: string,
  ) {}

  route(method: Method, path: string, options: RouteOptions, ...handlers: RequestHandler[]): this {
    const chain: RequestHandler[] = [enforce(options.policy)];
    if (options.body) chain.push(validateBody(options.body));
    this.router[method](path, ...chain, ...handlers);
    const full = `/api${this.mount}${path === '/' ? '' : path}`;
    this.specs.push({ method, path: full, tag: this.tag, ...options });
    return this;
  }
}
