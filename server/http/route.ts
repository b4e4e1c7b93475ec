import type { Request, Response, Router } from 'express';
import type { z } from 'zod';
import type { SignedInUser } from '../auth/sessions';
import { AppError } from './errors';
import { parseInput } from './validation';

export type Access = 'public' | 'signed-in' | 'admin';

export interface RouteContext<Body, Params> {
  body: Body;
  params: Params;
  user: SignedInUser | null;
  /** The current session's id, when signed in. */
  sessionId: string | null;
  req: Request;
  /** Queue a Set-Cookie header for the reply. */
  setCookie(serialized: string): void;
}

export interface RouteSpec<BodySchema extends z.ZodType, ParamsSchema extends z.ZodType> {
  method: 'get' | 'post' | 'patch' | 'delete';
  path: string;
  access: Access;
  body?: BodySchema;
  params?: ParamsSchema;
  status?: number;
  handler(ctx: RouteContext<z.output<BodySchema>, z.output<ParamsSchema>>): Promise<unknown>;
}

/** Declare a route: method, path, who may call it, input schemas, and a handler returning the JSON reply. */
export function route<B extends z.ZodType = z.ZodUnknown, P extends z.ZodType = z.ZodUnknown>(spec: RouteSpec<B, P>) {
  return spec as unknown as RouteSpec<z.ZodType, z.ZodType>;
}

function authorize(access: Access, user: SignedInUser | null): void {
  if (access === 'public') return;
  if (!user) throw new AppError('unauthenticated', 'Sign in to continue.');
  if (access === 'admin' && user.siteRole !== 'admin') throw new AppError('forbidden', 'Only site administrators may do this.');
}

export function mount(router: Router, specs: RouteSpec<z.ZodType, z.ZodType>[]): void {
  for (const spec of specs) {
    router[spec.method](spec.path, async (req: Request, res: Response) => {
      const user = res.locals.user as SignedInUser | null;
      authorize(spec.access, user);
      const params = spec.params ? parseInput(spec.params, req.params) : req.params;
      const body = spec.body ? parseInput(spec.body, req.body) : undefined;
      const cookies: string[] = [];
      const result = await spec.handler({ body, params, user, sessionId: (res.locals.sessionId as string | null) ?? null, req, setCookie: (c) => cookies.push(c) });
      if (cookies.length) res.append('Set-Cookie', cookies);
      if (result === undefined) res.status(spec.status ?? 204).end();
      else res.status(spec.status ?? 200).json(result);
    });
  }
}
