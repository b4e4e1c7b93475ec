import { z } from 'zod';
import { route, type AnyRouteSpec } from '../http/route';

function jsonSchema(schema: z.ZodType): unknown {
  try {
    return z.toJSONSchema(schema, { io: 'input', unrepresentable: 'any' });
  } catch {
    return {};
  }
}

/** OpenAPI 3.1 built from the same route declarations and zod schemas that validate requests. */
export function openApiDocument(specs: AnyRouteSpec[]) {
  const paths: Record<string, Record<string, unknown>> = {};
  for (const spec of specs) {
    const path = `/api${spec.path.replace(/:([A-Za-z]+)/g, '{$1}')}`;
    const parameters = [...spec.path.matchAll(/:([A-Za-z]+)/g)].map(([, name]) => ({ name, in: 'path', required: true, schema: { type: 'string' } }));
    if (spec.query) {
      const properties = (jsonSchema(spec.query) as { properties?: Record<string, unknown>; required?: string[] }).properties ?? {};
      const required = (jsonSchema(spec.query) as { required?: string[] }).required ?? [];
      for (const [name, schema] of Object.entries(properties)) parameters.push({ name, in: 'query', required: required.includes(name), schema: schema as { type: string } });
    }
    paths[path] ??= {};
    paths[path][spec.method] = {
      summary: spec.summary ?? `${spec.method.toUpperCase()} ${spec.path}`,
      security: spec.access === 'public' ? [] : [{ session: [] }],
      ...(spec.access === 'admin' ? { description: 'Site administrators only.' } : {}),
      ...(parameters.length ? { parameters } : {}),
      ...(spec.body ? { requestBody: { required: true, content: { 'application/json': { schema: jsonSchema(spec.body) } } } } : {}),
      responses: {
        [String(spec.status ?? 200)]: { description: 'Success' },
        default: { description: 'Error: { "error": { "code", "message", "fields"? } }' },
      },
    };
  }
  return {
    openapi: '3.1.0',
    info: { title: 'Rungbook API', version: process.env.npm_package_version ?? '0.1.0', description: 'JSON API of Rungbook. State-changing requests must carry the app\'s Origin.' },
    components: { securitySchemes: { session: { type: 'apiKey', in: 'cookie', name: 'rungbook_session' } } },
    paths,
  };
}

export function openApiRoutes(allSpecs: () => AnyRouteSpec[]) {
  let document: ReturnType<typeof openApiDocument> | undefined;
  return [
    route({ method: 'get', path: '/openapi.json', access: 'public', summary: 'This document',
      handler: async () => (document ??= openApiDocument(allSpecs())) }),
  ];
}
