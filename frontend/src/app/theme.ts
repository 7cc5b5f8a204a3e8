import type { ThemeConfig } from 'antd';
import { palette } from '@/config/palette';

export const fontFamily =
  "'IBM Plex Sans', system-ui, -apple-system, 'Segoe UI', Roboto, 'Helvetica Neue', Arial, sans-serif";

export const kilnTheme: ThemeConfig = {
  token: {
    fontFamily,
    fontSize: 14,
    colorPrimary: palette.ember,
    colorLink: palette.ember,
    colorSuccess: palette.ok,
    colorWarning: palette.warn,
    colorError: palette.down,
    colorInfo: palette.info,
    // Tinted backgrounds for alerts and messages, lighter than antd derives from
    // our darker, contrast-safe status colours.
    colorSuccessBg: '#eaf5f0',
    colorSuccessBorder: '#b6dccb',
    colorWarningBg: '#fbf4e2',
    colorWarningBorder: '#e6cf95',
    colorErrorBg: '#fcedef',
    colorErrorBorder: '#efb9c2',
    colorInfoBg: '#ebf2f8',
    colorInfoBorder: '#bcd2e5',
    colorText: palette.ink,
    colorTextSecondary: palette.inkMuted,
    colorBgLayout: palette.ash,
    colorBorder: '#cdd3d9',
    colorBorderSecondary: palette.line,
    borderRadius: 4,
    borderRadiusLG: 6,
    controlHeight: 32,
    wireframe: false,
  },
  components: {
    Layout: {
      siderBg: palette.soot,
      headerBg: '#ffffff',
      headerHeight: 52,
      headerPadding: '0 24px',
      bodyBg: palette.ash,
      triggerBg: palette.sootRaised,
    },
    Menu: {
      darkItemBg: palette.soot,
      darkSubMenuItemBg: palette.soot,
      darkItemColor: palette.sootText,
      darkItemHoverColor: '#ffffff',
      darkItemHoverBg: palette.sootRaised,
      darkItemSelectedBg: 'rgba(196, 86, 29, 0.22)',
      darkItemSelectedColor: '#ffffff',
      itemBorderRadius: 4,
      itemHeight: 38,
      itemMarginInline: 8,
    },
    Card: {
      headerFontSize: 15,
      headerHeight: 46,
    },
    Table: {
      headerBg: '#f7f8f9',
      headerColor: palette.inkMuted,
      cellPaddingBlockSM: 7,
    },
    Typography: {
      titleMarginBottom: 0,
      titleMarginTop: 0,
    },
  },
};
