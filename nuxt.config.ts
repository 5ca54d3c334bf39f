// Nuxt's configuration: modules, runtime settings filled from NUXT_* variables, and build choices.
export default defineNuxtConfig({
  compatibilityDate: '2026-11-01',
  modules: ['@pinia/nuxt', '@nuxtjs/tailwindcss', 'nuxt-auth-utils'],
  css: [
    '@fontsource/nunito/latin-400.css',
    '@fontsource/nunito/latin-600.css',
    '@fontsource/nunito/latin-700.css',
    '@fontsource/nunito/latin-800.css',
    '~/assets/css/main.css',
  ],
  devtools: { enabled: false },
  telemetry: false,
  app: {
    head: {
      htmlAttrs: { lang: 'en' },
      title: 'Evenhand',
      meta: [{ name: 'viewport', content: 'width=device-width, initial-scale=1' }],
      link: [{ rel: 'icon', type: 'image/svg+xml', href: '/favicon.svg' }],
    },
  },
  runtimeConfig: {
    db: {
      host: '127.0.0.1',
      port: 3306,
      user: 'evenhand',
      password: 'evenhand',
      database: 'evenhand',
    },
    smtp: {
      host: '127.0.0.1',
      port: 2525,
      from: 'Evenhand <no-reply@evenhand.test>',
    },
    public: {
      appName: 'Evenhand',
    },
  },
  // Tests build into folders of their own so they can run while `npm start` builds or serves .output.
  ...(process.env.EVENHAND_BUILD_DIR ? { buildDir: process.env.EVENHAND_BUILD_DIR } : {}),
  nitro: process.env.EVENHAND_OUTPUT_DIR ? { output: { dir: process.env.EVENHAND_OUTPUT_DIR } } : {},
  typescript: { strict: true, tsConfig: { exclude: ['../.output-test', '../public'] } },
})
