// https://nuxt.com/docs/api/configuration/nuxt-config
import { solveWorker } from './server/workers/build'

export default defineNuxtConfig({
  compatibilityDate: '2026-11-01',
  modules: ['@nuxtjs/tailwindcss', '@pinia/nuxt', 'nuxt-auth-utils', 'nuxt-security'],
  css: [
    '@fontsource/ibm-plex-sans/400.css',
    '@fontsource/ibm-plex-sans/600.css',
    '@fontsource/ibm-plex-mono/400.css',
    '~/assets/css/main.css',
  ],
  devtools: { enabled: false },
  // Security headers (nuxt-security): a CSP that allows only our own assets (scripts by nonce),
  // no framing, no MIME sniffing, no referrer. Its request-size limiter, rate limiter and XSS
  // filter are off: our routes limit sizes themselves (256 KB JSON, 8 MB photos), sign-ins and
  // probes have limits kept in the database (shared by every instance), and the XSS filter
  // refuses any body with "<" in it (a bank named "Bay <4>", a note "V < 5 %"); Vue escapes
  // all output and the CSP stops injected scripts.
  security: {
    headers: {
      contentSecurityPolicy: {
        'default-src': ['\'self\''],
        'base-uri': ['\'none\''],
        'connect-src': ['\'self\''],
        'font-src': ['\'self\''],
        'form-action': ['\'self\''],
        'frame-ancestors': ['\'none\''],
        'img-src': ['\'self\'', 'data:', 'blob:'],
        'object-src': ['\'none\''],
        'script-src': ['\'self\'', '\'strict-dynamic\'', '\'nonce-{{nonce}}\''],
        'script-src-attr': ['\'none\''],
        // Vue Flow and the canvas position parts with style attributes
        'style-src': ['\'self\'', '\'unsafe-inline\''],
        'worker-src': ['\'self\''],
        // TLS is the proxy's business (HSTS says so); on plain HTTP (tests, a LAN) this would break every asset
        'upgrade-insecure-requests': false,
      },
      xFrameOptions: 'DENY',
      referrerPolicy: 'no-referrer',
      xContentTypeOptions: 'nosniff',
    },
    requestSizeLimiter: false,
    rateLimiter: false,
    // subresource integrity guards assets served by a third party; ours come from the app itself, and its
    // hashes broke the Bench's first save (a client-side move to the bank's new address)
    sri: false,
    xssValidator: false,
    // same-site only: with no CORS handler no access-control-allow-origin is ever sent (its default
    // sent `*` to a request without Origin); cross-site writes are refused by server/middleware/same-origin.ts
    corsHandler: false,
  },
  telemetry: false,
  nitro: {
    // the engine's worker thread, bundled on its own beside the server (server/workers/build.ts)
    rollupConfig: { plugins: [solveWorker()] },
  },
  app: {
    head: {
      htmlAttrs: { lang: 'en' },
      title: 'Phaseloom',
      meta: [{ name: 'description', content: 'Wire, verify and plan three-phase transformer banks.' }],
      link: [{ rel: 'icon', type: 'image/svg+xml', href: '/favicon.svg' }],
    },
  },
  // Every key can be set from the environment (NUXT_ + the path in SCREAMING_SNAKE_CASE,
  // e.g. NUXT_MAIL_HOST, NUXT_SIGN_IN_LIMIT_WINDOW_SECONDS, NUXT_PUBLIC_BASE_URL).
  runtimeConfig: {
    databaseUrl: '',
    // behind a reverse proxy (NUXT_TRUST_PROXY=true) X-Forwarded-Host and X-Forwarded-Proto name the
    // address a browser used; off, they are ignored (anyone can send them to a server facing the world)
    trustProxy: false,
    // sealed-cookie sessions for 7 days; NUXT_SESSION_COOKIE_SECURE=false for plain HTTP on a LAN
    session: { maxAge: 60 * 60 * 24 * 7, cookie: { secure: true } },
    // 5 failed sign-ins per e-mail and IP within 15 minutes, then 429 until the window ends
    signInLimit: { attempts: 5, windowSeconds: 15 * 60 },
    // probes per fault-hunt attempt: 30 within 30 s, then 429 until the window ends
    probeLimit: { points: 30, windowSeconds: 30 },
    // the engine's worker threads and the time one solve may take (server/utils/engine-pool.ts)
    engine: { threads: 1, budgetSeconds: 2, maxQueue: 32, memoryMb: 512, nice: 10 },
    // anonymous POST /api/solve per IP: 60 within 60 s, then 429 (signed-in users are not limited)
    solveLimit: { points: 60, windowSeconds: 60 },
    // SMTP for outgoing mail; npm start and npm test point it at the local mail catcher
    mail: { host: '', port: 587, secure: false, user: '', password: '', from: 'Phaseloom <no-reply@phaseloom.test>' },
    // the mail catcher's directory; set only in development (npm start, npm test), it turns
    // on GET /api/admin/outbox, which is a 404 otherwise
    devOutboxDir: '',
    // lab-sheet photos: the fs driver under `dir` (.data/uploads), or any S3-compatible store
    // when `driver` is 's3' (NUXT_UPLOADS_DRIVER=s3, NUXT_UPLOADS_S3_BUCKET, ..._ENDPOINT, ...)
    uploads: { driver: 'fs', dir: '.data/uploads', s3: { bucket: '', endpoint: '', region: 'auto', accessKeyId: '', secretAccessKey: '' } },
    public: {
      // the address links in e-mails and share links start with
      baseUrl: 'http://localhost:3000',
    },
  },
})
