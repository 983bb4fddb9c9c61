// The heat map's colours: one hue, stepped classes, each class darker than the one below it, so
// that the map still reads when printed in greyscale or seen with any colour-vision deficiency.
// Pure module, shared by the browser (heat map, legend) and the unit tests.

/** A class of counts and the colour it is drawn in. */
export interface CountClass {
  /** Lowest count in the class (≥ 1; zero is "no visits", drawn in EMPTY_CELL_COLOUR). */
  min: number;
  /** Highest count in the class, inclusive. */
  max: number;
  colour: string;
  /** Ink or white, whichever contrasts more with `colour`, for a number written on the cell. */
  textColour: string;
  /** "1", "2–4", "50–112". */
  label: string;
}

/** Cells without visits: the page's paper, so that absence does not look like a small count. */
export const EMPTY_CELL_COLOUR = "#f7f3ea";
const INK = "#24231f";
const WHITE = "#ffffff";

/** The moss green of the palette, as an OKLCH hue angle in degrees. */
const HUE = 138;
/** OKLab lightness at the lightest and darkest end of the ramp. */
const LIGHTEST = 0.9;
const DARKEST = 0.3;

/**
 * A colour on the single-hue ramp: t = 0 is the lightest, t = 1 the darkest. Lightness falls
 * linearly in OKLab (Ottosson 2020, "A perceptual color space for image processing"), which
 * spaces the steps evenly to the eye; chroma swells in the middle so the mid-tones are not grey,
 * and is cut back where the colour would leave the sRGB gamut.
 */
export function rampColour(t: number): string {
  const clamped = Math.min(1, Math.max(0, t));
  const lightness = LIGHTEST + (DARKEST - LIGHTEST) * clamped;
  let chroma = 0.04 + 0.07 * Math.sin(Math.PI * clamped);
  for (;;) {
    const rgb = oklchToLinearSrgb(lightness, chroma, HUE);
    if (rgb.every((c) => c >= 0 && c <= 1) || chroma <= 0) return linearSrgbToHex(rgb);
    chroma = Math.max(0, chroma - 0.005);
  }
}

/**
 * Splits 1..maxCount into at most `maxClasses` classes of roughly geometric width, their lower
 * bounds rounded to whole numbers below ten and to 1-2-5 numbers above, and gives each a colour from the ramp (lightest for the
 * lowest counts). Forage counts are skewed — a few plants carry most visits — so equal-width
 * classes would paint almost every cell the lightest colour. With maxCount ≤ maxClasses every
 * count gets its own class. maxCount < 1 gives no classes.
 */
export function countClasses(maxCount: number, maxClasses = 6): CountClass[] {
  const top = Math.floor(maxCount);
  if (!(top >= 1)) return [];
  const lowers: number[] = [];
  if (top <= maxClasses) {
    for (let n = 1; n <= top; n++) lowers.push(n);
  } else {
    lowers.push(1);
    for (let i = 1; i < maxClasses; i++) {
      const bound = roundBound(Math.pow(top, i / maxClasses));
      if (bound > lowers[lowers.length - 1]! && bound <= top) lowers.push(bound);
    }
  }
  return lowers.map((min, i) => {
    const max = i + 1 < lowers.length ? lowers[i + 1]! - 1 : top;
    const colour = rampColour(lowers.length === 1 ? 1 : i / (lowers.length - 1));
    return { min, max, colour, textColour: readableOn(colour), label: min === max ? String(min) : `${min}–${max}` };
  });
}

/** The class a count falls in, or null for zero (and for anything outside the classes). */
export function classOf(classes: readonly CountClass[], count: number): CountClass | null {
  return classes.find((c) => count >= c.min && count <= c.max) ?? null;
}

/** Ink or white: the one with the higher WCAG contrast ratio against `background`. */
export function readableOn(background: string): string {
  return contrastRatio(background, INK) >= contrastRatio(background, WHITE) ? INK : WHITE;
}

/**
 * Relative luminance as WCAG 2.x defines it (WCAG 2.1, "relative luminance"): sRGB channels
 * linearised with the 0.03928 threshold, weighted 0.2126 R + 0.7152 G + 0.0722 B.
 */
export function relativeLuminance(hex: string): number {
  const [r, g, b] = hexToSrgb(hex).map((c) => (c <= 0.03928 ? c / 12.92 : Math.pow((c + 0.055) / 1.055, 2.4)));
  return 0.2126 * r! + 0.7152 * g! + 0.0722 * b!;
}

/** WCAG 2.x contrast ratio (L1 + 0.05) / (L2 + 0.05), the lighter colour's luminance on top. */
export function contrastRatio(a: string, b: string): number {
  const [light, dark] = [relativeLuminance(a), relativeLuminance(b)].sort((x, y) => y - x);
  return (light! + 0.05) / (dark! + 0.05);
}

// Small bounds stay as they are (rounding 3 to 2 would merge classes a small map needs); from
// ten up they become 1-2-5 numbers, which are easier to read in a legend.
function roundBound(x: number): number {
  return x < 10 ? Math.round(x) : niceRound(x);
}

function niceRound(x: number): number {
  const power = Math.pow(10, Math.floor(Math.log10(x)));
  const fraction = x / power;
  const nice = fraction < 1.5 ? 1 : fraction < 3.5 ? 2 : fraction < 7.5 ? 5 : 10;
  return nice * power;
}

// OKLCH → OKLab → linear sRGB, with the matrices of Ottosson 2020.
function oklchToLinearSrgb(lightness: number, chroma: number, hueDegrees: number): [number, number, number] {
  const hue = (hueDegrees * Math.PI) / 180;
  const a = chroma * Math.cos(hue);
  const b = chroma * Math.sin(hue);
  const l = Math.pow(lightness + 0.3963377774 * a + 0.2158037573 * b, 3);
  const m = Math.pow(lightness - 0.1055613458 * a - 0.0638541728 * b, 3);
  const s = Math.pow(lightness - 0.0894841775 * a - 1.291485548 * b, 3);
  return [
    4.0767416621 * l - 3.3077115913 * m + 0.2309699292 * s,
    -1.2684380046 * l + 2.6097574011 * m - 0.3413193965 * s,
    -0.0041960863 * l - 0.7034186147 * m + 1.707614701 * s,
  ];
}

// IEC 61966-2-1 sRGB transfer function.
function linearSrgbToHex(rgb: readonly number[]): string {
  return `#${rgb
    .map((c) => {
      const encoded = c <= 0.0031308 ? 12.92 * c : 1.055 * Math.pow(c, 1 / 2.4) - 0.055;
      return Math.round(Math.min(1, Math.max(0, encoded)) * 255)
        .toString(16)
        .padStart(2, "0");
    })
    .join("")}`;
}

function hexToSrgb(hex: string): [number, number, number] {
  const match = /^#?([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(hex.trim());
  if (!match) throw new RangeError(`not a #rrggbb colour: ${hex}`);
  return [parseInt(match[1]!, 16) / 255, parseInt(match[2]!, 16) / 255, parseInt(match[3]!, 16) / 255];
}
