// Metro configuration: Expo's defaults, plus, for `npm run dev`, a pass-through
// of /api/* from the web dev server (:8081) to the API server, so the app in
// development talks to its API on the same origin as in production.
const http = require('node:http');
const { getDefaultConfig } = require('expo/metro-config');

const config = getDefaultConfig(__dirname);
const apiPort = Number(process.env.KEELSON_API_PORT || process.env.PORT || 8080);

const previous = config.server?.enhanceMiddleware;
config.server = {
  ...config.server,
  enhanceMiddleware: (middleware, server) => {
    const next = previous ? previous(middleware, server) : middleware;
    return (req, res, fallthrough) => {
      if (!req.url || !req.url.startsWith('/api/')) return next(req, res, fallthrough);
      // The Host header is kept, so the API's same-origin check sees the page's own origin.
      const upstream = http.request({ host: '127.0.0.1', port: apiPort, path: req.url, method: req.method, headers: req.headers }, (answer) => {
        res.writeHead(answer.statusCode ?? 502, answer.headers);
        answer.pipe(res);
      });
      upstream.on('error', () => {
        res.writeHead(502, { 'Content-Type': 'application/json' });
        res.end(JSON.stringify({ error: 'api_unreachable', message: `The API server is not answering on port ${apiPort}.` }));
      });
      req.pipe(upstream);
    };
  },
};

module.exports = config;
