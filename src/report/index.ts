export { colorWanted, createStyle } from './style.js';
export type { TextStyle } from './style.js';
export { renderMeasureText } from './measureText.js';
