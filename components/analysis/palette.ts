/**
 * Seedplot's chart palette for entries: eight hues spaced around the wheel with alternating light
 * and dark values, so neighbours differ in lightness as well as hue and stay apart for red-green and
 * blue-yellow colour vision deficiencies. Lines also get their own symbol, so colour is never the only cue.
 */
export const ENTRY_COLOURS = ["#1d4f91", "#e69a28", "#5fa8d3", "#8a2d5c", "#2c8c79", "#c4572d", "#3b3b3b", "#b49bd6"] as const;
export const ENTRY_SYMBOLS = ["circle", "square", "triangle", "diamond", "star", "cross", "wye", "times"] as const;

export const colourFor = (index: number) => ENTRY_COLOURS[index % ENTRY_COLOURS.length]!;
