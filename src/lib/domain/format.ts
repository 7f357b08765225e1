/**
 * How Bearline writes numbers, units and dates: one module for pages, islands, the aim sheet
 * and messages, so that the same figure reads the same everywhere.
 *
 * Precision follows what the figure can be used for (common practice in RF survey work):
 * bearings and tilts to 0.1° (a hand compass or inclinometer reads no finer), dB figures to
 * 0.1 dB, RSRP in whole dBm in lists (meters report 1 dB steps, 3GPP TS 36.133 §9.1.4) and to
 * 0.1 dBm where a median or a prediction is compared, distances in metres below 1 km and in
 * kilometres above. Dates are ISO 8601 (YYYY-MM-DD); times are written in UTC and say so, so
 * the server and the browser print the same text.
 *
 * Every function takes null, undefined or a non-finite number and returns MISSING.
 */

/** What a missing figure prints as. */
export const MISSING = '—';

type Maybe = number | null | undefined;

const isNumber = (v: Maybe): v is number => typeof v === 'number' && Number.isFinite(v);

/** Fixed decimals without "-0.0": a value that rounds to zero prints unsigned. */
export function formatNumber(v: Maybe, digits = 0): string {
  if (!isNumber(v)) return MISSING;
  const text = v.toFixed(digits);
  return Number(text) === 0 ? text.replace('-', '') : text;
}

/** A plus sign for gains and changes: "+3.2", "-1.0", "0.0". */
export function formatSigned(v: Maybe, digits = 1): string {
  if (!isNumber(v)) return MISSING;
  const text = formatNumber(v, digits);
  return Number(text) > 0 ? `+${text}` : text;
}

function withUnit(text: string, unit: string): string {
  return text === MISSING ? MISSING : `${text} ${unit}`;
}

/** Whole numbers with thousands separators: "12,345". */
export function formatCount(v: Maybe): string {
  if (!isNumber(v)) return MISSING;
  return Math.round(v)
    .toString()
    .replace(/\B(?=(\d{3})+(?!\d))/g, ',');
}

/** "1 reading", "3 readings". */
export function formatQuantity(v: number, singular: string, plural = `${singular}s`): string {
  return `${formatCount(v)} ${v === 1 ? singular : plural}`;
}

// --- radio ---------------------------------------------------------------------------------

/** RSRP and other powers: whole dBm by default ("-97 dBm"), 0.1 dBm where medians are compared. */
export function formatDbm(v: Maybe, digits: 0 | 1 = 0): string {
  return withUnit(formatNumber(v, digits), 'dBm');
}

/** Ratios, losses and gains in dB to 0.1 ("7.5 dB"); `signed` for gains and changes ("+3.2 dB"). */
export function formatDb(v: Maybe, options: { signed?: boolean; digits?: number } = {}): string {
  const digits = options.digits ?? 1;
  return withUnit(options.signed ? formatSigned(v, digits) : formatNumber(v, digits), 'dB');
}

/** Antenna gain: "11.0 dBi". */
export function formatDbi(v: Maybe): string {
  return withUnit(formatNumber(v, 1), 'dBi');
}

/**
 * Frequencies: 0.1 MHz on the usual rasters, more decimals only where the channel needs them
 * ("3500.01 MHz"). `unit: false` leaves the unit off, for a value printed beside its unit.
 */
export function formatMhz(v: Maybe, options: { unit?: boolean } = {}): string {
  if (!isNumber(v)) return MISSING;
  const tenths = Math.abs(v * 10 - Math.round(v * 10)) < 1e-6;
  const text = tenths ? formatNumber(v, 1) : String(Number(v.toFixed(3)));
  return options.unit === false ? text : withUnit(text, 'MHz');
}

/** Throughput: whole Mbit/s from 10 up, 0.1 below. */
export function formatMbps(v: Maybe): string {
  if (!isNumber(v)) return MISSING;
  return withUnit(formatNumber(v, Math.abs(v) >= 10 ? 0 : 1), 'Mbit/s');
}

// --- angles ---------------------------------------------------------------------------------

/** An angle to 0.1°: "12.3°". */
export function formatDegrees(v: Maybe, digits = 1): string {
  const text = formatNumber(v, digits);
  return text === MISSING ? MISSING : `${text}°`;
}

/** A bearing 0–360° to 0.1°, with what it is measured from when given: "123.4° true". 359.96° prints as 0.0°. */
export function formatBearing(v: Maybe, reference?: 'true' | 'magnetic'): string {
  if (!isNumber(v)) return MISSING;
  const rounded = Math.round((((v % 360) + 360) % 360) * 10) / 10;
  const text = `${formatNumber(rounded === 360 ? 0 : rounded, 1)}°`;
  return reference ? `${text} ${reference}` : text;
}

/** An antenna's tilt to 0.1° with its direction: "2.4° up", "0.8° down", "0.0°". */
export function formatTilt(v: Maybe): string {
  if (!isNumber(v)) return MISSING;
  const text = formatNumber(Math.abs(v), 1);
  if (Number(text) === 0) return `${text}°`;
  return `${text}° ${v > 0 ? 'up' : 'down'}`;
}

// --- lengths and places -------------------------------------------------------------------

/**
 * A distance: metres below 1 km ("850 m", "4.2 m" under 10 m), kilometres above ("2.35 km",
 * "12.3 km" from 10 km). A figure that rounds to 1000 m prints as "1.00 km".
 */
export function formatDistance(metres: Maybe): string {
  if (!isNumber(metres)) return MISSING;
  const m = Math.abs(metres);
  if (m < 9.95) return withUnit(formatNumber(metres, 1), 'm');
  if (m < 999.5) return withUnit(formatNumber(metres, 0), 'm');
  if (m < 9995) return withUnit(formatNumber(metres / 1000, 2), 'km');
  return withUnit(formatNumber(metres / 1000, 1), 'km');
}

/** Heights and lengths of kit in metres: "6.5 m" (0.1 m, or `digits`). */
export function formatMetres(v: Maybe, digits = 1): string {
  return withUnit(formatNumber(v, digits), 'm');
}

/** Area: "12.3 km²". */
export function formatArea(km2: Maybe): string {
  return withUnit(formatNumber(km2, 1), 'km²');
}

/** A position, latitude first: 5 decimals (about 1 m) by default. */
export function formatLatLon(lat: Maybe, lon: Maybe, digits = 5): string {
  if (!isNumber(lat) || !isNumber(lon)) return MISSING;
  return `${formatNumber(lat, digits)}, ${formatNumber(lon, digits)}`;
}

/** A fraction as a percentage: "61 %" (digits after the point when asked). */
export function formatPercent(fraction: Maybe, digits = 0): string {
  if (!isNumber(fraction)) return MISSING;
  return withUnit(formatNumber(fraction * 100, digits), '%');
}

/** File sizes: "512 B", "34 kB", "12.5 MB" (binary multiples). */
export function formatBytes(n: Maybe): string {
  if (!isNumber(n)) return MISSING;
  if (n >= 1024 * 1024) return withUnit(formatNumber(n / (1024 * 1024), 1), 'MB');
  if (n >= 1024) return withUnit(formatNumber(n / 1024, 0), 'kB');
  return withUnit(formatNumber(n, 0), 'B');
}

// --- dates ----------------------------------------------------------------------------------

type DateLike = Date | string | null | undefined;

function toDate(v: DateLike): Date | null {
  if (v === null || v === undefined || v === '') return null;
  // A plain date is a calendar day, not an instant: read it as that day in UTC.
  const d = typeof v === 'string' ? new Date(/^\d{4}-\d{2}-\d{2}$/.test(v) ? `${v}T00:00:00Z` : v) : v;
  return Number.isNaN(d.getTime()) ? null : d;
}

/** The calendar day, ISO 8601: "2026-12-02" (UTC for instants). */
export function formatDate(v: DateLike): string {
  const d = toDate(v);
  return d ? d.toISOString().slice(0, 10) : MISSING;
}

/** Day and time to the minute in UTC: "2026-12-02 14:05 UTC". */
export function formatDateTime(v: DateLike): string {
  const d = toDate(v);
  return d ? `${d.toISOString().slice(0, 10)} ${d.toISOString().slice(11, 16)} UTC` : MISSING;
}

const WEEKDAYS = ['Sunday', 'Monday', 'Tuesday', 'Wednesday', 'Thursday', 'Friday', 'Saturday'] as const;

/** A visit day with its weekday, for schedules: "Wednesday 2026-12-02". */
export function formatDayWithWeekday(v: DateLike): string {
  const d = toDate(v);
  return d ? `${WEEKDAYS[d.getUTCDay()]} ${formatDate(d)}` : MISSING;
}
