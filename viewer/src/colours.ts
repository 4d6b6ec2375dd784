// Side colours shared with the reports: teal for left (solid lines), burnt orange for right (dashed).
export const LEFT_COLOUR = 0x0f7b74;
export const RIGHT_COLOUR = 0xb3541e;
export const CENTRE_COLOUR = 0x4a5560;
export const LEFT_CSS = '#0f7b74';
export const RIGHT_CSS = '#b3541e';
