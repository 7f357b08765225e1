// Create bodies of catalogue items (POST /api/catalogue/antennas, …/cables) for tests.

/** Common-practice customer panel: 7–9 dBi over 700–2700 MHz, ~40° beam. */
export const PANEL_BODY = {
  name: 'Test panel',
  kind: 'directional',
  ports: 2,
  horizontal_beamwidth_deg: 40,
  gain_table: [
    { freq_mhz: 700, gain_dbi: 7 },
    { freq_mhz: 1800, gain_dbi: 8.5 },
    { freq_mhz: 2700, gain_dbi: 9 },
  ],
};

/** LL-10-class losses (10.3 mm foam datasheet formula, from memory, verify). */
export const FEEDER_BODY = {
  name: 'Test feeder',
  loss_table: [
    { freq_mhz: 800, loss_db_per_m: 0.12 },
    { freq_mhz: 2600, loss_db_per_m: 0.23 },
  ],
};
