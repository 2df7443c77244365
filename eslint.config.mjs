// ESLint: the framework's own rules (@nuxt/eslint-config) with ESLint Stylistic as the formatter (`npm run lint:fix`).
// The stylistic options describe the style the code already has, so `--fix` on a file changes little.
import { createConfigForNuxt } from '@nuxt/eslint-config/flat'

export default createConfigForNuxt({
  features: {
    stylistic: { indent: 2, quotes: 'single', semi: false, commaDangle: 'always-multiline', braceStyle: '1tbs', arrowParens: true, quoteProps: 'as-needed' },
  },
  dirs: {
    src: ['.'],
    pages: ['pages'],
    layouts: ['layouts'],
    components: ['components'],
    composables: ['composables', 'utils'],
    plugins: ['plugins'],
    modules: ['modules'],
    middleware: ['middleware'],
    servers: ['server'],
  },
})
  .append({
    ignores: ['.nuxt/**', '.output/**', '.data/**', 'data/**', 'docs/**', 'tests/fixtures/**', 'tests/artifacts/**'],
  })
  .append({
    name: 'kerfbook/style',
    rules: {
      '@stylistic/quotes': ['error', 'single', { avoidEscape: true, allowTemplateLiterals: 'always' }],
      '@stylistic/operator-linebreak': ['error', 'after', { overrides: { '?': 'before', ':': 'before', '|': 'before', '&': 'before' } }],
      '@stylistic/member-delimiter-style': ['error', { multiline: { delimiter: 'none' }, singleline: { delimiter: 'semi', requireLast: false } }],
      // Parentheses around a mixed expression are kept only where they change the meaning.
      '@stylistic/no-mixed-operators': 'off',
      '@stylistic/max-len': ['error', { code: 160, ignoreUrls: true, ignoreStrings: true, ignoreTemplateLiterals: true, ignoreRegExpLiterals: true, ignoreComments: true }],
      // Templates keep short elements and their attributes on one line.
      'vue/max-attributes-per-line': 'off',
      'vue/singleline-html-element-content-newline': 'off',
      'vue/multiline-html-element-content-newline': 'off',
      'vue/html-self-closing': ['error', { html: { void: 'always', normal: 'always', component: 'always' }, svg: 'always', math: 'always' }],
    },
  })
  .append({
    name: 'kerfbook/tests',
    files: ['tests/**'],
    // Test fixtures (`test.extend`) must destructure their first argument, even when they need nothing from it.
    rules: { 'no-empty-pattern': 'off' },
  })
