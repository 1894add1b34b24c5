import forms from '@tailwindcss/forms';

/** @type {import('tailwindcss').Config} */
export default {
	content: ['./src/**/*.{html,js,svelte,ts}'],
	theme: {
		extend: {
			fontFamily: {
				sans: ['Inter', 'system-ui', 'sans-serif']
			},
			colors: {
				// Traywise's own palette: deep teal for action, warm amber for caution.
				tide: {
					50: '#eefaf8',
					100: '#d5f2ee',
					200: '#aee4dd',
					300: '#79cfc6',
					400: '#46b2a9',
					500: '#2b968e',
					600: '#1f7873',
					700: '#1c605d',
					800: '#1a4d4b',
					900: '#163f3e'
				},
				ember: {
					50: '#fff8eb',
					100: '#fdeac6',
					500: '#d97706',
					700: '#92400e'
				}
			},
			minHeight: { touch: '44px' },
			minWidth: { touch: '44px' }
		}
	},
	plugins: [forms]
};
