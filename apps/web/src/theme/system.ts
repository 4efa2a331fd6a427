import { createSystem, defaultBaseConfig, defineConfig } from '@chakra-ui/react';
import {
  alertSlotRecipe,
  animationStyles,
  badgeRecipe,
  breakpoints,
  buttonRecipe,
  checkboxSlotRecipe,
  checkmarkRecipe,
  codeRecipe,
  containerRecipe,
  dataListSlotRecipe,
  dialogSlotRecipe,
  fieldSlotRecipe,
  fieldsetSlotRecipe,
  globalCss,
  headingRecipe,
  iconRecipe,
  inputRecipe,
  keyframes,
  layerStyles,
  linkRecipe,
  listSlotRecipe,
  nativeSelectSlotRecipe,
  semanticTokens,
  separatorRecipe,
  sliderSlotRecipe,
  spinnerRecipe,
  tableSlotRecipe,
  textareaRecipe,
  textStyles,
  tokens,
} from '@chakra-ui/react/theme';

/*
 * Chakra's theme with only the recipes of the components this app uses (Chakra's own
 * `defaultConfig` carries every component's recipe, about 30 KB gzipped, into every page, the
 * recorder pad's first load included). A component added to the app needs its recipe here.
 */
const chakraTheme = defineConfig({
  preflight: true,
  cssVarsPrefix: 'chakra',
  cssVarsRoot: ':where(html, .chakra-theme)',
  globalCss,
  theme: {
    breakpoints,
    keyframes,
    tokens,
    semanticTokens,
    textStyles,
    layerStyles,
    animationStyles,
    recipes: {
      badge: badgeRecipe,
      button: buttonRecipe,
      checkmark: checkmarkRecipe,
      code: codeRecipe,
      container: containerRecipe,
      heading: headingRecipe,
      icon: iconRecipe,
      input: inputRecipe,
      link: linkRecipe,
      separator: separatorRecipe,
      spinner: spinnerRecipe,
      textarea: textareaRecipe,
    },
    slotRecipes: {
      alert: alertSlotRecipe,
      checkbox: checkboxSlotRecipe,
      dataList: dataListSlotRecipe,
      dialog: dialogSlotRecipe,
      field: fieldSlotRecipe,
      fieldset: fieldsetSlotRecipe,
      list: listSlotRecipe,
      nativeSelect: nativeSelectSlotRecipe,
      slider: sliderSlotRecipe,
      table: tableSlotRecipe,
    },
  },
});

/*
 * Steadyhand's own look. Deep ink navy for the frame, a calm sea-glass teal for what you can
 * do, signal amber for what is due and a strong red for what is overdue. Sizes are generous
 * because the app is used one-handed, standing, under stress.
 */

const fontStack = `'Atkinson Hyperlegible', system-ui, -apple-system, 'Segoe UI', Roboto, Arial, sans-serif`;

const config = defineConfig({
  globalCss: {
    html: {
      colorPalette: 'brand',
      // Chakra's own focus rings default to 1-2 px; too faint on a tablet across a bed.
      '--focus-ring-width': '3px',
      bg: 'bg.canvas',
    },
    body: {
      fontFamily: 'body',
      textStyle: 'lg',
      color: 'fg',
      bg: 'bg.canvas',
      minHeight: '100dvh',
    },
    // Keyboard focus must be obvious everywhere, also on plain links and headings we focus.
    '*:focus-visible': {
      outlineWidth: '3px',
      outlineStyle: 'solid',
      outlineColor: 'focus',
      outlineOffset: '2px',
    },
  },
  theme: {
    tokens: {
      fonts: {
        heading: { value: fontStack },
        body: { value: fontStack },
      },
      colors: {
        ink: {
          50: { value: '#eef2f8' },
          100: { value: '#d6deea' },
          200: { value: '#aebdd4' },
          300: { value: '#8096b8' },
          400: { value: '#587197' },
          500: { value: '#3d5578' },
          600: { value: '#2d4060' },
          700: { value: '#22324c' },
          800: { value: '#19263b' },
          900: { value: '#0f1b2e' },
          950: { value: '#08101d' },
        },
        seaglass: {
          50: { value: '#edf8f6' },
          100: { value: '#d2eee9' },
          200: { value: '#a6ddd4' },
          300: { value: '#74c7bb' },
          400: { value: '#48ada0' },
          500: { value: '#2d9285' },
          600: { value: '#21766d' },
          700: { value: '#1c5f59' },
          800: { value: '#1a4d49' },
          900: { value: '#18403d' },
          950: { value: '#0a2523' },
        },
        signal: {
          50: { value: '#fff8e5' },
          100: { value: '#ffedbd' },
          200: { value: '#ffdc80' },
          300: { value: '#ffc740' },
          400: { value: '#f5ae14' },
          500: { value: '#d99300' },
          600: { value: '#b07400' },
          700: { value: '#875800' },
          800: { value: '#6b4505' },
          900: { value: '#583908' },
          950: { value: '#331f00' },
        },
        alarm: {
          50: { value: '#fef1f1' },
          100: { value: '#fddcdc' },
          200: { value: '#fab8b8' },
          300: { value: '#f48a8a' },
          400: { value: '#e95959' },
          500: { value: '#d63333' },
          600: { value: '#b91e23' },
          700: { value: '#9a191e' },
          800: { value: '#7e181c' },
          900: { value: '#69191d' },
          950: { value: '#3a080a' },
        },
      },
    },
    semanticTokens: {
      colors: {
        // The brand palette works with colorPalette="brand" on any Chakra component.
        brand: {
          solid: { value: '{colors.seaglass.700}' },
          contrast: { value: '{colors.white}' },
          fg: { value: '{colors.seaglass.800}' },
          muted: { value: '{colors.seaglass.200}' },
          subtle: { value: '{colors.seaglass.100}' },
          emphasized: { value: '{colors.seaglass.300}' },
          focusRing: { value: '{colors.seaglass.500}' },
          border: { value: '{colors.seaglass.600}' },
        },
        ink: {
          solid: { value: '{colors.ink.900}' },
          contrast: { value: '{colors.white}' },
          fg: { value: '{colors.ink.800}' },
          muted: { value: '{colors.ink.200}' },
          subtle: { value: '{colors.ink.100}' },
          emphasized: { value: '{colors.ink.300}' },
          focusRing: { value: '{colors.seaglass.400}' },
          border: { value: '{colors.ink.600}' },
        },
        /** Something is due now (for example the next epinephrine window has opened). */
        due: {
          solid: { value: '{colors.signal.400}' },
          contrast: { value: '{colors.ink.950}' },
          fg: { value: '{colors.signal.700}' },
          muted: { value: '{colors.signal.200}' },
          subtle: { value: '{colors.signal.50}' },
          emphasized: { value: '{colors.signal.300}' },
          focusRing: { value: '{colors.signal.500}' },
          border: { value: '{colors.signal.500}' },
        },
        /** Something is past its window. Always paired with a shape or a word, never colour alone. */
        overdue: {
          solid: { value: '{colors.alarm.600}' },
          contrast: { value: '{colors.white}' },
          fg: { value: '{colors.alarm.700}' },
          muted: { value: '{colors.alarm.200}' },
          subtle: { value: '{colors.alarm.50}' },
          emphasized: { value: '{colors.alarm.300}' },
          focusRing: { value: '{colors.alarm.500}' },
          border: { value: '{colors.alarm.600}' },
        },
        bg: {
          canvas: { value: '#f4f6f9' },
          header: { value: '{colors.ink.900}' },
        },
        fg: {
          header: { value: '{colors.white}' },
          headerMuted: { value: '{colors.ink.200}' },
        },
        focus: { value: '{colors.seaglass.500}' },
      },
    },
    recipes: {
      button: {
        base: {
          // 48 px is the smallest target anywhere in the general UI.
          minH: '12',
          fontWeight: 'bold',
        },
        variants: {
          size: {
            sm: { h: '12', minW: '12', px: '4', textStyle: 'md' },
            md: { h: '12', minW: '12', px: '5', textStyle: 'lg' },
            lg: { h: '14', minW: '14', px: '6', textStyle: 'lg' },
            xl: { h: '16', minW: '16', px: '7', textStyle: 'xl' },
            '2xl': { h: '20', minW: '20', px: '8', textStyle: '2xl' },
          },
        },
      },
      input: {
        variants: {
          size: {
            lg: { textStyle: 'lg', '--input-height': 'sizes.12' },
            xl: { textStyle: 'lg', '--input-height': 'sizes.14' },
          },
        },
        defaultVariants: { size: 'lg' },
      },
      heading: {
        base: { color: 'ink.900', fontWeight: 'bold' },
      },
    },
    slotRecipes: {
      field: {
        // The same slots as Chakra's own field recipe, so the merge adds none.
        slots: fieldSlotRecipe.slots ?? [],
        base: {
          label: { textStyle: 'lg', fontWeight: 'bold' },
          errorText: { textStyle: 'md', fontWeight: 'bold' },
          helperText: { textStyle: 'md' },
        },
      },
    },
  },
});

export const system = createSystem(defaultBaseConfig, chakraTheme, config);
