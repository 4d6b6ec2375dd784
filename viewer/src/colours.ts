// Side colours shared with the reports: teal for left (solid lines), burnt orange for right (dashed).
export const LEFT_COLOUR = 0x0f7b74;
export const RIGHT_COLOUR = 0xb3541e;
export const CENTRE_COLOUR = 0x4a5560;
export const LEFT_CSS = '#0f7b74';
export const RIGHT_CSS = '#b3541e';
// The forecast overlay: violet outlined in white, apart from both side colours and the grey trunk.
export const FORECAST_COLOUR = 0x6b3fc0;
export const FORECAST_OUTLINE = 0xffffff;
export const FORECAST_CSS = '#6b3fc0';
