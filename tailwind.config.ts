import type { Config } from 'tailwindcss'

// Kerfbook's own palette: spruce (primary), copper (accent), slate-warm neutrals ("stone"),
// plus signal colours for findings. Severity is never shown by colour alone.
export default {
  content: ['./components/**/*.vue', './layouts/**/*.vue', './pages/**/*.vue', './app.vue', './error.vue'],
  theme: {
    extend: {
      fontFamily: {
        sans: ['Manrope', 'system-ui', 'sans-serif'],
      },
      colors: {
        spruce: {
          50: '#eef6f5',
          100: '#d5e9e6',
          200: '#a9d2cc',
          300: '#74b4ab',
          500: '#2f7f76',
          600: '#24665f',
          700: '#1d524d',
          800: '#17403c',
          900: '#10302d',
        },
        copper: {
          50: '#fbf3ec',
          100: '#f5e0cd',
          300: '#e0a271',
          500: '#c06a2b',
          600: '#a4561f',
          700: '#84441a',
        },
        signal: {
          error: '#b42318',
          warning: '#9a6700',
          info: '#2459a8',
          ok: '#1f7a3f',
        },
      },
      fontSize: {
        display: ['2rem', { lineHeight: '2.4rem', fontWeight: '800' }],
      },
      borderRadius: {
        panel: '0.6rem',
      },
    },
  },
  plugins: [],
} satisfies Config
