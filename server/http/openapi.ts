import { OpenAPIRegistry, OpenApiGeneratorV31 } from '@asteasolutions/zod-to-openapi';

export function createRegistry(): OpenAPIRegistry {
  const registry = new OpenAPIRegistry();
  registry.registerComponent('securitySchemes', 'session', {
    type: 'apiKey',
    in: 'cookie',
    name: 'authjs.session-token',
    description: 'The Auth.js session cookie set by POST /auth/callback/credentials or a sign-in link.',
  });
  registry.registerComponent('securitySchemes', 'gaugeToken', {
    type: 'http',
    scheme: 'bearer',
    description: "A gauge's upload token (Authorization: Bearer <token>), issued by POST /api/v1/gauges/{id}/token.",
  });
  return registry;
}

export function buildOpenApiDocument(registry: OpenAPIRegistry) {
  return new OpenApiGeneratorV31(registry.definitions).generateDocument({
    openapi: '3.1.0',
    info: {
      title: 'Brackline API',
      version: '1.0.0',
      description:
        'River flood plumes, exposure bands and lease screening. Screening-level estimates from simplified physics: they do not replace the shellfish control authority\'s classification, closures or sampling.',
    },
    servers: [{ url: '/' }],
  });
}
