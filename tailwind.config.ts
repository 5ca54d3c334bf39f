import type { Config } from 'tailwindcss'
import defaultTheme from 'tailwindcss/defaultTheme'

// Evenhand's own theme: a warm paper ground, deep ink, and a single calm teal for actions.
export default {
  darkMode: 'media',
  content: [],
  theme: {
    extend: {
      // Nunito must come first here, or Tailwind's font-sans wins and the shipped font never loads.
      fontFamily: { sans: ['Nunito', ...defaultTheme.fontFamily.sans] },
      colors: {
        paper: { DEFAULT: '#fbf8f3', dim: '#f1ece3', night: '#15181d', nightdim: '#1f242b' },
        ink: { DEFAULT: '#1d2733', soft: '#4a5868', faint: '#7d8a99', night: '#e8e4dc', nightsoft: '#b5bcc6' },
        reed: { 50: '#eef8f6', 100: '#d3eee9', 500: '#1f8a7a', 600: '#17705f', 700: '#12594c', 300: '#6cc3b3' },
        ember: { 100: '#fde8dc', 300: '#fdba74', 500: '#c2410c', 700: '#9a3412' },
      },
      borderRadius: { xl2: '1.25rem' },
      // A phone held sideways: the practice page packs the drill, the keys and the start into its few hundred pixels.
      screens: { 'phone-landscape': { raw: '(orientation: landscape) and (max-height: 500px)' } },
    },
  },
} satisfies Config
