// Kerfbook: Nuxt 4 with the project root as source folder (no app/ folder).
export default defineNuxtConfig({
  compatibilityDate: '2026-11-01',
  srcDir: '.',
  serverDir: 'server',
  dir: { app: '.' },
  modules: ['@nuxtjs/tailwindcss', '@pinia/nuxt', 'nuxt-auth-utils'],
  css: ['@fontsource/manrope/400.css', '@fontsource/manrope/600.css', '@fontsource/manrope/800.css'],
  tailwindcss: { cssPath: '~/assets/css/tailwind.css', viewer: false },
  devtools: { enabled: false },
  telemetry: false,
  typescript: { strict: true },
  app: {
    head: {
      htmlAttrs: { lang: 'en' },
      title: 'Kerfbook',
      link: [{ rel: 'icon', type: 'image/svg+xml', href: '/logo.svg' }],
    },
  },
  runtimeConfig: {
    // The password comes from NUXT_SESSION_PASSWORD at run time; '' is nuxt-auth-utils' own default.
    session: { maxAge: 60 * 60 * 24 * 14, password: '' },
  },
  nitro: {
    // Native and dialect-probing packages stay outside the bundle; Nitro copies them into .output.
    externals: { external: ['knex', 'better-sqlite3', 'pg', 'piscina'] },
  },
  // Development helpers (the dev SMTP sink's messages, reset links among them) are not even built into production.
  $production: { nitro: { ignore: ['api/dev/**'] } },
})
