// The sign-in load of `npm run bench -- load`, run by autocannon in its own process: each request
// pair is a fresh visit (GET /api/auth/csrf for a session and its token) and a sign-in with the right
// password (POST /api/auth/login). Prints autocannon's JSON result.
// Usage: node tests/bench/sign-in-load.mjs <base url> <email> <password> <connections> <seconds>
import autocannon from 'autocannon';

const [url, email, password, connections, seconds] = process.argv.slice(2);
const result = await autocannon({
  url,
  connections: Number(connections),
  duration: Number(seconds),
  requests: [
    {
      method: 'GET',
      path: '/api/auth/csrf',
      setupRequest: (req) => ({ ...req, headers: {} }),
      onResponse: (status, body, context, headers) => {
        // Raw header names keep their case (Set-Cookie).
        const key = Object.keys(headers).find((k) => k.toLowerCase() === 'set-cookie');
        const raw = key ? headers[key] : undefined;
        const first = Array.isArray(raw) ? raw[0] : raw;
        context.cookie = first ? first.split(';')[0] : '';
        context.token = JSON.parse(body).csrfToken;
      },
    },
    {
      method: 'POST',
      path: '/api/auth/login',
      setupRequest: (req, context) => ({
        ...req,
        headers: {
          cookie: context.cookie,
          'x-csrf-token': context.token,
          'content-type': 'application/json',
        },
        body: JSON.stringify({ email, password }),
      }),
    },
  ],
});
process.stdout.write(JSON.stringify(result));
