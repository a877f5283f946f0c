import type { ThemeConfig } from 'antd';

// Deep instrument green on a calm, slightly warm grey; square-ish corners like a panel.
export const ACCENT = '#17695C';

export const theme: ThemeConfig = {
  token: {
    colorPrimary: ACCENT,
    colorInfo: ACCENT,
    // Derived info tints come out murky from a dark green; set them to a light wash of the accent.
    colorInfoBg: '#EAF3F0',
    colorInfoBorder: '#BCD8D0',
    colorLink: ACCENT,
    colorSuccess: '#2E7D4F',
    colorWarning: '#B7791F',
    colorError: '#B3261E',
    colorBgLayout: '#F6F7F5',
    colorBorderSecondary: '#E3E6E1',
    colorBorder: '#CDD3CC',
    colorText: '#1E2623',
    colorTextSecondary: '#5A6661',
    fontFamily: "'Source Sans 3', ui-sans-serif, system-ui, -apple-system, 'Segoe UI', Roboto, sans-serif",
    fontSize: 14,
    borderRadius: 4,
    controlHeight: 30,
    wireframe: false,
  },
  components: {
    Layout: {
      headerBg: '#FFFFFF',
      headerHeight: 52,
      headerPadding: '0 16px',
      siderBg: '#FFFFFF',
      bodyBg: '#F6F7F5',
    },
    Table: {
      headerBg: '#EEF1ED',
      headerColor: '#36413D',
      rowHoverBg: '#F1F6F4',
      cellPaddingBlock: 8,
      cellPaddingBlockMD: 7,
      cellPaddingBlockSM: 5,
    },
    Menu: {
      itemHeight: 34,
      itemBg: 'transparent',
      itemSelectedBg: '#E2EFEB',
      itemSelectedColor: ACCENT,
      groupTitleFontSize: 12,
    },
    Card: { headerFontSize: 15, headerHeightSM: 40 },
    Button: { primaryShadow: 'none', defaultShadow: 'none', dangerShadow: 'none', fontWeight: 500 },
    Descriptions: { itemPaddingBottom: 8 },
    Tag: { defaultBg: '#F0F2EF' },
  },
};
