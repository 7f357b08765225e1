/**
 * Coordinates typed or pasted by a person: decimal degrees, hemisphere letters, degrees–minutes(–seconds).
 * Accepted, e.g.: "52.1, -1.2" · "52.1N 1.2W" · "N52.1 W1.2" · `52°12'19.1"N 0°7'18.5"E` ·
 * "52 12 19.1 N, 0 7 18.5 E" · "52°12.318'N 0°7.308'E" · "geo:52.1,-1.2".
 * "-47,21 -128,52" (decimal commas). Without hemisphere letters the order is latitude, longitude.
 */
import type { LatLon } from './geodesy';

export class CoordinateParseError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'CoordinateParseError';
  }
}

/** The text is a position, but one that cannot exist (latitude beyond ±90°, longitude beyond ±180°). */
export class CoordinateRangeError extends CoordinateParseError {
  constructor(message: string) {
    super(message);
    this.name = 'CoordinateRangeError';
  }
}

type Token =
  | { kind: 'number'; text: string; value: number }
  | { kind: 'unit'; unit: 0 | 1 | 2 }
  | { kind: 'hemisphere'; letter: 'N' | 'S' | 'E' | 'W' }
  | { kind: 'separator' };

type Axis = 'lat' | 'lon';

interface Component {
  value: number;
  axis: Axis | null;
}

const UNIT_INDEX: Record<string, 0 | 1 | 2> = { '°': 0, "'": 1, '"': 2 };

function normaliseInput(input: string): string {
  return input
    .trim()
    .toUpperCase()
    .replace(/^GEO:/, '')
    .replace(/[′’‘´`]{2}|''/g, '"')
    .replace(/[′’‘´`]/g, "'")
    .replace(/[″“”]/g, '"')
    .replace(/[º˚]/g, '°')
    .replace(/[−–]/g, '-')
    .replace(/^(.*)$/, readDecimalCommas);
}

/**
 * "-47,21 -128,52": decimal commas, as many locales write them. Only when there are no points and
 * exactly two numbers with a comma inside them; a lone comma ("52,1") stays the separator.
 */
function readDecimalCommas(text: string): string {
  if (text.includes('.')) return text;
  const inside = text.match(/\d,\d/g) ?? [];
  return inside.length === 2 ? text.replace(/(\d),(\d)/g, '$1.$2') : text;
}

function tokenise(text: string): Token[] {
  const tokens: Token[] = [];
  const pattern = /\s*(?:([+-]?\d+(?:\.\d+)?)|([°'"])|([NSEW])|([,;/]))/y;
  let position = 0;
  while (position < text.length) {
    pattern.lastIndex = position;
    const match = pattern.exec(text);
    if (!match) {
      const rest = text.slice(position).trimStart();
      if (rest === '') break;
      throw new CoordinateParseError(`Unexpected '${rest[0]}' in the coordinates`);
    }
    position = pattern.lastIndex;
    const [, number, unit, letter] = match;
    if (number !== undefined) tokens.push({ kind: 'number', text: number, value: Number(number) });
    else if (unit !== undefined) tokens.push({ kind: 'unit', unit: UNIT_INDEX[unit]! });
    else if (letter !== undefined) tokens.push({ kind: 'hemisphere', letter: letter as 'N' | 'S' | 'E' | 'W' });
    else tokens.push({ kind: 'separator' });
  }
  return tokens;
}

/** Splits the token list into the two coordinate components. */
function splitComponents(tokens: Token[]): [Token[], Token[]] {
  const separators = tokens.filter((t) => t.kind === 'separator').length;
  if (separators > 1) throw new CoordinateParseError('Give exactly two coordinates, latitude and longitude');
  if (separators === 1) {
    const at = tokens.findIndex((t) => t.kind === 'separator');
    return [tokens.slice(0, at), tokens.slice(at + 1)];
  }
  const hemispheres = tokens.flatMap((t, i) => (t.kind === 'hemisphere' ? [i] : []));
  if (hemispheres.length > 0) {
    // Prefix letters ("N52 W1") start each component; suffix letters ("52N 1W") end one.
    const at = tokens[0]!.kind === 'hemisphere' ? hemispheres[1] : hemispheres[0]! + 1;
    if (at !== undefined && at > 0 && at < tokens.length) return [tokens.slice(0, at), tokens.slice(at)];
  }
  const degreeMarks = tokens.flatMap((t, i) => (t.kind === 'unit' && t.unit === 0 ? [i] : []));
  if (degreeMarks.length === 2) {
    const at = degreeMarks[1]! - 1;
    return [tokens.slice(0, at), tokens.slice(at)];
  }
  const numbers = tokens.filter((t) => t.kind === 'number').length;
  if (tokens.length === numbers && [2, 4, 6].includes(numbers)) {
    return [tokens.slice(0, numbers / 2), tokens.slice(numbers / 2)];
  }
  throw new CoordinateParseError('Cannot tell where the latitude ends and the longitude begins; separate them with a comma');
}

function parseComponent(tokens: Token[]): Component {
  let hemisphere: 'N' | 'S' | 'E' | 'W' | null = null;
  const parts: Array<{ text: string; value: number; unit: 0 | 1 | 2 | null }> = [];
  tokens.forEach((token, i) => {
    if (token.kind === 'hemisphere') {
      if (hemisphere || (i !== 0 && i !== tokens.length - 1)) {
        throw new CoordinateParseError('Put one hemisphere letter before or after each coordinate');
      }
      hemisphere = token.letter;
    } else if (token.kind === 'number') {
      parts.push({ text: token.text, value: token.value, unit: null });
    } else if (token.kind === 'unit') {
      const last = parts[parts.length - 1];
      if (!last || last.unit !== null) throw new CoordinateParseError('A °, \' or " mark must follow a number');
      last.unit = token.unit;
    }
  });
  if (parts.length === 0) throw new CoordinateParseError('A coordinate is missing its number');
  if (parts.length > 3) throw new CoordinateParseError('Use at most degrees, minutes and seconds');

  const fields = [0, 0, 0];
  let position = 0;
  parts.forEach((part, i) => {
    const slot = part.unit ?? position;
    if (slot < position || slot > 2) throw new CoordinateParseError('Write degrees, then minutes, then seconds');
    if (i > 0 && /^[+-]/.test(part.text)) throw new CoordinateParseError('Only the degrees may carry a sign');
    if (i < parts.length - 1 && !Number.isInteger(part.value)) {
      throw new CoordinateParseError('Only the last of degrees, minutes and seconds may have decimals');
    }
    if (slot > 0 && part.value >= 60) throw new CoordinateParseError(`${slot === 1 ? 'Minutes' : 'Seconds'} must be below 60`);
    fields[slot] = part.value;
    position = slot + 1;
  });

  const negative = parts[0]!.text.startsWith('-');
  const magnitude = Math.abs(fields[0]!) + fields[1]! / 60 + fields[2]! / 3600;
  const letter = hemisphere as 'N' | 'S' | 'E' | 'W' | null;
  if (letter && negative) throw new CoordinateParseError('Use either a minus sign or a hemisphere letter, not both');
  const southOrWest = letter === 'S' || letter === 'W';
  return {
    value: negative || southOrWest ? -magnitude : magnitude,
    axis: letter === null ? null : letter === 'N' || letter === 'S' ? 'lat' : 'lon',
  };
}

/** Parses a typed position; throws CoordinateParseError with a message fit to show the person. */
export function parseCoordinates(input: string): LatLon {
  const text = normaliseInput(input);
  if (text === '') throw new CoordinateParseError('Enter a latitude and a longitude');
  const [first, second] = splitComponents(tokenise(text)).map(parseComponent) as [Component, Component];

  let lat: number;
  let lon: number;
  if (first.axis !== null && first.axis === second.axis) {
    throw new CoordinateParseError(first.axis === 'lat' ? 'Both coordinates are latitudes (N/S)' : 'Both coordinates are longitudes (E/W)');
  }
  if (first.axis === 'lon' || second.axis === 'lat') [lat, lon] = [second.value, first.value];
  else [lat, lon] = [first.value, second.value];

  if (Math.abs(lat) > 90) throw new CoordinateRangeError(`Latitude ${lat} is outside −90 … 90`);
  if (Math.abs(lon) > 180) throw new CoordinateRangeError(`Longitude ${lon} is outside −180 … 180`);
  return { lat: lat + 0, lon: lon + 0 };
}

/** Like `parseCoordinates`, returning null instead of throwing. */
export function tryParseCoordinates(input: string): LatLon | null {
  try {
    return parseCoordinates(input);
  } catch (error) {
    if (error instanceof CoordinateParseError) return null;
    throw error;
  }
}

/** "52.205300, 0.121800" — latitude first, fixed decimals (6 ≈ 0.1 m). */
export function formatDecimal(point: LatLon, decimals = 6): string {
  return `${point.lat.toFixed(decimals)}, ${point.lon.toFixed(decimals)}`;
}

function formatDmsValue(value: number, positive: string, negative: string, secondDecimals: number): string {
  const scale = 10 ** secondDecimals;
  // Round the total seconds first so 59.96″ carries into the minutes instead of printing 60.0″.
  const totalSeconds = Math.round(Math.abs(value) * 3600 * scale) / scale;
  const degrees = Math.floor(totalSeconds / 3600);
  const minutes = Math.floor((totalSeconds - degrees * 3600) / 60);
  const seconds = totalSeconds - degrees * 3600 - minutes * 60;
  const letter = value < 0 && totalSeconds > 0 ? negative : positive;
  return `${degrees}°${minutes}'${seconds.toFixed(secondDecimals)}"${letter}`;
}

/** `52°12'19.1"N 0°7'18.5"E` — degrees, minutes, seconds with hemisphere letters. */
export function formatDms(point: LatLon, secondDecimals = 1): string {
  return `${formatDmsValue(point.lat, 'N', 'S', secondDecimals)} ${formatDmsValue(point.lon, 'E', 'W', secondDecimals)}`;
}
