// Kerfbook: Nuxt 4 with the project root as source folder (no app/ folder).
export default defineNuxtConfig({
  modules: ['@nuxtjs/tailwindcss', '@pinia/nuxt', 'nuxt-auth-utils'],
  // Development helpers (the dev SMTP sink's messages, reset links among them) are not even built into production.
  $production: { nitro: { ignore: ['api/dev/**'] } },
  devtools: { enabled: false },
  app: {
    head: {
      htmlAttrs: { lang: 'en' },
      title: 'Kerfbook',
      link: [{ rel: 'icon', type: 'image/svg+xml', href: '/logo.svg' }],
    },
  },
  css: ['@fontsource/manrope/400.css', '@fontsource/manrope/600.css', '@fontsource/manrope/800.css'],
  runtimeConfig: {
    // The password comes from NUXT_SESSION_PASSWORD at run time; '' is nuxt-auth-utils' own default.
    session: { maxAge: 60 * 60 * 24 * 14, password: '' },
  },
  dir: { app: '.' },
  srcDir: '.',
  serverDir: 'server',
  compatibilityDate: '2026-11-01',
  nitro: {
    // Native and dialect-probing packages stay outside the bundle; Nitro copies them into .output.
    externals: { external: ['knex', 'better-sqlite3', 'pg', 'piscina'] },
  },
  typescript: { strict: true },
  telemetry: false,
  tailwindcss: { cssPath: '~/assets/css/tailwind.css', viewer: false },
})
