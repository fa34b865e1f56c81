/**
 * Grainyard's look, in one place: an off-white "sawdust" ground, dark walnut ink, moss green for
 * actions and a cut-cherry heartwood accent. Fraunces for headings, IBM Plex Sans for everything
 * else. The same values are exposed as CSS custom properties in src/styles/base.css.
 */
import type { GlobalThemeOverrides } from "naive-ui";

export const palette = {
  ground: "#f6f1e8", // sawdust
  surface: "#fffdf8", // planed maple
  sapwood: "#ecd8b4",
  line: "#d8cab4",
  ink: "#2a211b", // walnut
  inkMuted: "#5d5047",
  moss: "#3d5a31",
  mossHover: "#4a6b3c",
  mossPressed: "#304827",
  mossSoft: "#e3ead9",
  heartwood: "#9c4d1d",
  heartwoodHover: "#b0602c",
  heartwoodPressed: "#7a3f1c",
  bark: "#5b2d12",
  error: "#a3302a",
  errorHover: "#b8433c",
  errorPressed: "#862520",
  warning: "#8a5a00",
  info: "#2f5d73",
} as const;

export const fonts = {
  // fontaine's metric-matched fallbacks are named here by hand: it only rewrites CSS, not these strings.
  body: "'IBM Plex Sans', 'IBM Plex Sans fallback', system-ui, -apple-system, 'Segoe UI', sans-serif",
  display: "'Fraunces', 'Fraunces fallback', Georgia, 'Times New Roman', serif",
  mono: "ui-monospace, 'SFMono-Regular', Menlo, monospace",
} as const;

export const themeOverrides: GlobalThemeOverrides = {
  common: {
    fontFamily: fonts.body,
    fontFamilyMono: fonts.mono,
    fontSize: "16px",
    fontSizeMedium: "16px",
    fontSizeLarge: "17px",
    fontWeightStrong: "600",
    lineHeight: "1.55",
    borderRadius: "6px",
    borderRadiusSmall: "4px",
    heightMedium: "44px",
    heightLarge: "50px",
    bodyColor: palette.ground,
    cardColor: palette.surface,
    modalColor: palette.surface,
    popoverColor: palette.surface,
    inputColor: palette.surface,
    textColorBase: palette.ink,
    textColor1: palette.ink,
    textColor2: palette.ink,
    textColor3: palette.inkMuted,
    placeholderColor: "#76695e",
    borderColor: palette.line,
    dividerColor: palette.line,
    primaryColor: palette.moss,
    primaryColorHover: palette.mossHover,
    primaryColorPressed: palette.mossPressed,
    primaryColorSuppl: palette.mossHover,
    infoColor: palette.info,
    infoColorHover: "#3b6f87",
    infoColorPressed: "#244a5c",
    infoColorSuppl: "#3b6f87",
    warningColor: palette.warning,
    warningColorHover: "#a06a08",
    warningColorPressed: "#6d4700",
    warningColorSuppl: "#a06a08",
    errorColor: palette.error,
    errorColorHover: palette.errorHover,
    errorColorPressed: palette.errorPressed,
    errorColorSuppl: palette.errorHover,
    successColor: palette.moss,
    successColorHover: palette.mossHover,
    successColorPressed: palette.mossPressed,
    successColorSuppl: palette.mossHover,
  },
  Button: {
    heightMedium: "44px",
    heightLarge: "50px",
    fontSizeMedium: "16px",
    fontSizeLarge: "17px",
    fontWeight: "600",
    paddingMedium: "0 20px",
    paddingLarge: "0 26px",
  },
  Input: {
    heightMedium: "46px",
    fontSizeMedium: "16px",
    border: `1px solid #b7a78f`,
    borderHover: `1px solid ${palette.mossHover}`,
    borderFocus: `1px solid ${palette.moss}`,
    boxShadowFocus: `0 0 0 3px rgba(61, 90, 49, 0.22)`,
  },
  Form: {
    labelFontSizeTopMedium: "15px",
    labelTextColor: palette.ink,
    feedbackFontSizeMedium: "14px",
    feedbackTextColor: palette.inkMuted,
    feedbackTextColorError: palette.error,
  },
  Card: {
    borderRadius: "10px",
    color: palette.surface,
    borderColor: palette.line,
    titleFontSizeMedium: "20px",
    titleFontWeight: "600",
  },
  Alert: {
    borderRadius: "8px",
    fontSize: "15px",
  },
};
