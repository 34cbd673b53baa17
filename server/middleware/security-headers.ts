/**
 * helmet with a Content-Security-Policy for our own bundle: scripts, styles, fonts and the service
 * worker from our origin only; images also as data: and blob: (plan tiles and photos drawn on the
 * device). Dev mode (Vite's middleware) needs inline scripts/styles and the HMR websocket.
 */
import helmet from 'helmet';

export function securityHeaders(options: { https: boolean; devMode: boolean }) {
  const dev = options.devMode;
  return helmet({
    contentSecurityPolicy: {
      useDefaults: false,
      directives: {
        defaultSrc: ["'self'"],
        scriptSrc: dev ? ["'self'", "'unsafe-inline'"] : ["'self'"],
        styleSrc: dev ? ["'self'", "'unsafe-inline'"] : ["'self'"],
        fontSrc: ["'self'", 'data:'],
        imgSrc: ["'self'", 'data:', 'blob:'],
        connectSrc: dev ? ["'self'", 'ws:', 'wss:'] : ["'self'"],
        workerSrc: ["'self'"],
        manifestSrc: ["'self'"],
        objectSrc: ["'none'"],
        baseUri: ["'self'"],
        formAction: ["'self'"],
        frameAncestors: ["'none'"],
        ...(options.https ? { upgradeInsecureRequests: [] } : {}),
      },
    },
    // HSTS only means something over https; on http://127.0.0.1 it would be ignored anyway.
    strictTransportSecurity: options.https,
  });
}
