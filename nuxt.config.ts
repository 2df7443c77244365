export default defineNuxtConfig({
  compatibilityDate: '2026-11-01',
  srcDir: '.',
  modules: ['@nuxtjs/tailwindcss', '@pinia/nuxt', 'nuxt-auth-utils'],
  css: ['@fontsource/manrope/400.css', '@fontsource/manrope/600.css', '@fontsource/manrope/800.css'],
  devtools: { enabled: false },
  telemetry: false,
  typescript: { strict: true },
  app: { head: { title: 'Kerfbook', link: [{ rel: 'icon', type: 'image/svg+xml', href: '/logo.svg' }] } },
  runtimeConfig: {
    databasePath: 'data/kerfbook.sqlite',
    smtpUrl: 'smtp://127.0.0.1:1025',
    mailFrom: 'Kerfbook <desk@example.test>',
    outboxUrl: '',
    trustProxy: false,
    signInLimitPerMinute: 10,
    public: { appUrl: 'http://127.0.0.1:3000', workshopName: 'Kerfbook' },
  },
  nitro: {
    externals: { external: ['knex', 'better-sqlite3'] },
  },
})
