import { useEffect, useMemo, useRef, useState } from 'react';
import { catalogueApi } from '../../lib/client/catalogue-api';
import { operatorsApi } from '../../lib/client/operators-api';
import { plansApi } from '../../lib/client/plans-api';
import { shortlistApi } from '../../lib/client/shortlist-api';
import { toolsApi } from '../../lib/client/tools-api';
import type { PathJson } from '../../lib/schemas/tools';
import type { AntennaJson } from '../../lib/schemas/catalogue';
import type { ShortlistItemJson } from '../../lib/schemas/shortlist';
import type { LatLon } from '../../lib/domain/geodesy';
import { checkKitForm, chooseSelection, readMetres, readPlannerUrl, writePlannerUrl, type KitForm } from '../../lib/client/planner-state';
import { useDebounced } from '../tools/useDebounced';
import { useQuery, useSubmit } from '../ui/use-api';
import AddressSearch from './AddressSearch';
import PlannerMap from './PlannerMap';
import ShortlistTable from './ShortlistTable';
import TerrainChart from './TerrainChart';
import { GradeBadge, TERRAIN_LABELS, describeConfidence } from './grades';
import {
  MISSING,
  formatBearing,
  formatDb,
  formatDbm,
  formatDistance,
  formatLatLon,
  formatMbps,
  formatMetres,
  formatMhz,
  formatTilt,
} from '../../lib/domain/format';

export interface PlannerCustomer {
  id: string;
  name: string;
  addressLabel: string | null;
  lat: number | null;
  lon: number | null;
  currentAntennaId: string | null;
  /** The customer's SIM operator, if known: the shortlist lists only its cells. */
  currentOperatorId?: string | null;
}

interface Props {
  customer: PlannerCustomer | null;
  canSave: boolean;
}

const positionKey = (p: LatLon | null) => (p ? `${p.lat.toFixed(6)},${p.lon.toFixed(6)}` : '');

export default function PlannerApp({ customer, canSave }: Props) {
  // A shared or reloaded link restores position, kit and the selected cell; a customer's own position wins.
  const fromUrl = useMemo(() => readPlannerUrl(window.location.search), []);
  const [position, setPosition] = useState<LatLon | null>(
    customer?.lat != null && customer.lon != null ? { lat: customer.lat, lon: customer.lon } : fromUrl.position,
  );
  const [addressLabel, setAddressLabel] = useState<string | null>(customer?.addressLabel ?? null);
  const [typedLabel, setTypedLabel] = useState<string | null>(position && !customer ? formatLatLon(position.lat, position.lon) : null);
  const [kit, setKit] = useState<KitForm>({
    antennaId: '',
    cableId: '',
    cableM: '10',
    heightM: '6',
    operator: '',
    simOperator: customer?.currentOperatorId ?? '',
    ...fromUrl.kit,
  });
  const [selected, setSelected] = useState<string | null>(fromUrl.cellId);
  const wantedCell = useRef<string | null>(fromUrl.cellId);
  const shortlistAt = useRef<string>('');
  const kitErrors = checkKitForm(kit);
  const kitValid = Object.keys(kitErrors).length === 0;

  // The kit to choose from, once; the first directional antenna and the first cable unless a link chose.
  const choices = useQuery('choices', () => Promise.all([catalogueApi.antennas(), catalogueApi.cables(), operatorsApi.list()]), {
    failed: 'Could not load the catalogue',
    onSuccess: ([a, c]) => {
      const directional = a.items.find((x) => x.kind === 'directional') ?? a.items[0];
      setKit((k) => ({
        ...k,
        antennaId: k.antennaId && a.items.some((x) => x.id === k.antennaId) ? k.antennaId : (directional?.id ?? ''),
        cableId: fromUrl.kit.cableId !== undefined ? k.cableId : (c.items[0]?.id ?? ''),
      }));
    },
  });
  const [antennas, cables, operators] = [choices.data?.[0].items ?? [], choices.data?.[1].items ?? [], choices.data?.[2].items ?? []];

  // The URL follows the planner: a new position is a new history entry (Back returns to the last one).
  const lastUrlPosition = useRef(positionKey(position));
  useEffect(() => {
    const search = writePlannerUrl(window.location.search, { position: customer ? null : position, kit, cellId: selected });
    const url = `${window.location.pathname}${search}`;
    if (url === `${window.location.pathname}${window.location.search}`) return;
    if (positionKey(position) !== lastUrlPosition.current) window.history.pushState(null, '', url);
    else window.history.replaceState(null, '', url);
    lastUrlPosition.current = positionKey(position);
  }, [position, kit, selected, customer]);
  useEffect(() => {
    const onPop = () => {
      const back = readPlannerUrl(window.location.search);
      lastUrlPosition.current = positionKey(back.position);
      if (!customer) {
        setPosition(back.position);
        setTypedLabel(back.position ? formatLatLon(back.position.lat, back.position.lon) : '');
      }
      setKit((k) => ({ ...k, ...back.kit }));
      wantedCell.current = back.cellId;
      setSelected(back.cellId);
    };
    window.addEventListener('popstate', onPop);
    return () => window.removeEventListener('popstate', onPop);
  }, [customer]);

  const request = useDebounced(position && kit.antennaId && kitValid ? JSON.stringify({ ...position, ...kit }) : null, 300);
  const asked = request ? (JSON.parse(request) as LatLon & KitForm) : null;
  const list = useQuery(
    asked && `${request}|${customer?.currentAntennaId ?? ''}`,
    () =>
      shortlistApi.get({
        lat: asked!.lat,
        lon: asked!.lon,
        height_m: readMetres(asked!.heightM),
        antenna_id: asked!.antennaId,
        cable_id: asked!.cableId,
        cable_m: asked!.cableId ? readMetres(asked!.cableM) : 0,
        operator: asked!.operator,
        sim_operator: asked!.simOperator,
        current_antenna_id: customer?.currentAntennaId ?? '',
      }),
    {
      failed: 'Could not build the shortlist',
      // An unfinished kit field keeps the last shortlist on show.
      keepWhenIdle: true,
      onSuccess: (s) => {
        const at = positionKey(asked);
        const samePosition = shortlistAt.current === at;
        shortlistAt.current = at;
        // Read the wanted cell now: React may run the updater after it has been cleared below.
        const wanted = wantedCell.current;
        setSelected((cur) => chooseSelection(s.items, cur, { samePosition, wanted }));
        wantedCell.current = null;
      },
    },
  );
  const shortlist = list.data;
  const error = list.error ?? choices.error;

  const chosen = useMemo(() => shortlist?.items.find((i) => i.cell_id === selected) ?? null, [shortlist, selected]);

  // Keyed on the cell and the position's values: a new object for the same place asks nothing new.
  const path = useQuery(
    chosen && position && kitValid ? `${chosen.cell_id}|${position.lat}|${position.lon}|${kit.heightM}` : null,
    () =>
      toolsApi.path({
        from: `${position!.lat},${position!.lon}`,
        to: `${chosen!.mast.lat},${chosen!.mast.lon}`,
        freq_mhz: chosen!.freq_mhz,
        h1_m: readMetres(kit.heightM),
        h2_m: chosen!.antenna_height_m ?? 25,
      }),
    { keepOnError: false },
  );
  const profile = path.loading ? null : path.data;

  const fieldError = (k: 'height_m' | 'cable_m') => kitErrors[k] ?? list.fields[k]?.[0];
  const setK = (patch: Partial<KitForm>) => setKit((k) => ({ ...k, ...patch }));

  return (
    <div className="grid gap-4 lg:grid-cols-[22rem_1fr]">
      <aside className="space-y-4">
        <section className="card space-y-3" aria-labelledby="where-heading">
          <h2 id="where-heading">Where</h2>
          {customer && (
            <p className="text-sm">
              Planning for{' '}
              <a className="font-semibold underline" href={`/customers/${customer.id}`}>
                {customer.name}
              </a>
            </p>
          )}
          <AddressSearch
            text={typedLabel}
            onPick={(m) => {
              setPosition({ lat: m.lat, lon: m.lon });
              setAddressLabel(m.kind === 'address' ? m.label : null);
            }}
          />
          <p className="text-xs text-ink-600" data-testid="plan-position">
            {position
              ? `Position ${formatLatLon(position.lat, position.lon)}${shortlist?.customer_ground_m != null ? ` · ground ${formatMetres(shortlist.customer_ground_m, 0)}` : ''}`
              : 'Search an address, type coordinates, or click the map.'}
          </p>
        </section>
        <section className="card" aria-labelledby="kit-heading">
          <h2 id="kit-heading">Kit</h2>
          <div className="mt-3 grid grid-cols-2 gap-3">
            <div className="col-span-2">
              <label htmlFor="kit-antenna" className="field-label">
                Antenna
              </label>
              <select id="kit-antenna" className="field-input" value={kit.antennaId} onChange={(e) => setK({ antennaId: e.target.value })}>
                {antennas.map((a) => (
                  <option key={a.id} value={a.id}>
                    {a.name} ({a.kind}, {a.ports}-port)
                  </option>
                ))}
              </select>
            </div>
            <div className="col-span-2">
              <label htmlFor="kit-cable" className="field-label">
                Cable
              </label>
              <select id="kit-cable" className="field-input" value={kit.cableId} onChange={(e) => setK({ cableId: e.target.value })}>
                <option value="">None (antenna at the router)</option>
                {cables.map((c) => (
                  <option key={c.id} value={c.id}>
                    {c.name}
                  </option>
                ))}
              </select>
            </div>
            <div>
              <label htmlFor="kit-length" className="field-label">
                Cable length (m)
              </label>
              <input
                id="kit-length"
                className="field-input"
                inputMode="decimal"
                value={kit.cableM}
                disabled={!kit.cableId}
                required={!!kit.cableId}
                onChange={(e) => setK({ cableM: e.target.value })}
                aria-invalid={!!fieldError('cable_m')}
                aria-describedby={fieldError('cable_m') ? 'kit-length-error' : undefined}
              />
              {fieldError('cable_m') && (
                <p id="kit-length-error" className="field-error">
                  {fieldError('cable_m')}
                </p>
              )}
            </div>
            <div>
              <label htmlFor="kit-height" className="field-label">
                Mount height (m)
              </label>
              <input
                id="kit-height"
                className="field-input"
                inputMode="decimal"
                value={kit.heightM}
                required
                onChange={(e) => setK({ heightM: e.target.value })}
                aria-invalid={!!fieldError('height_m')}
                aria-describedby={fieldError('height_m') ? 'kit-height-error' : undefined}
              />
              {fieldError('height_m') && (
                <p id="kit-height-error" className="field-error">
                  {fieldError('height_m')}
                </p>
              )}
            </div>
            <div className="col-span-2">
              <label htmlFor="kit-operator" className="field-label">
                Preferred operator
              </label>
              <select id="kit-operator" className="field-input" value={kit.operator} onChange={(e) => setK({ operator: e.target.value })}>
                <option value="">No preference</option>
                {operators.map((o) => (
                  <option key={o.id} value={o.id}>
                    {o.name}
                  </option>
                ))}
              </select>
            </div>
            <div className="col-span-2">
              <label htmlFor="kit-sim" className="field-label">
                Customer’s SIM operator
              </label>
              <select id="kit-sim" className="field-input" value={kit.simOperator} onChange={(e) => setK({ simOperator: e.target.value })}>
                <option value="">Any operator</option>
                {operators.map((o) => (
                  <option key={o.id} value={o.id}>
                    {o.name} only
                  </option>
                ))}
              </select>
            </div>
          </div>
        </section>
      </aside>

      <div className="min-w-0 space-y-4">
        <div className="card h-[22rem] overflow-hidden p-0 sm:h-[28rem]">
          <PlannerMap
            position={position}
            items={shortlist?.items ?? []}
            selectedCellId={selected}
            onPickPosition={(p) => {
              setPosition(p);
              setAddressLabel(null);
              setTypedLabel(formatLatLon(p.lat, p.lon));
            }}
            onSelect={setSelected}
          />
        </div>
        {error && (
          <p role="alert" className="rounded-md border border-alarm-100 bg-alarm-50 px-3 py-2 text-sm text-alarm-700">
            {error.message}
          </p>
        )}
        {shortlist && shortlist.warnings.length > 0 && (
          <ul className="rounded-md border border-ember-100 bg-ember-50 px-3 py-2 text-sm text-ember-700" data-testid="position-warnings">
            {shortlist.warnings.map((w) => (
              <li key={w}>{w}</li>
            ))}
          </ul>
        )}
        <section className="card min-w-0" aria-labelledby="shortlist-heading" aria-busy={list.loading}>
          <div className="mb-2 flex flex-wrap items-baseline gap-2">
            <h2 id="shortlist-heading">ShortlistJson</h2>
            {shortlist && (
              <span className="text-sm text-ink-600">
                {shortlist.total} cells within {formatDistance(shortlist.radius_m)} · {shortlist.kit.antenna.name}
                {shortlist.kit.cable ? `, ${formatMetres(shortlist.kit.cable_m)} ${shortlist.kit.cable.name}` : ''}
                {shortlist.current_antenna ? ` · gain vs ${shortlist.current_antenna.name}` : ''}
                {shortlist.required_operator_id ? ` · ${operators.find((o) => o.id === shortlist.required_operator_id)?.name ?? 'one operator'} only` : ''} ·
                ranked by RSRP and SINR
              </span>
            )}
            {list.loading && (
              <span className="text-sm text-ink-500" role="status">
                Calculating…
              </span>
            )}
          </div>
          {shortlist ? (
            <ShortlistTable items={shortlist.items} selectedCellId={selected} onSelect={setSelected} />
          ) : (
            <p className="text-sm text-ink-600">The ranked candidates appear here once a position is set.</p>
          )}
        </section>
        {chosen && (
          <CandidateDetail
            item={chosen}
            profile={profile}
            canSave={canSave}
            customer={customer}
            addressLabel={addressLabel}
            position={position!}
            kit={kit}
            antennas={antennas}
          />
        )}
      </div>
    </div>
  );
}

function CandidateDetail(props: {
  item: ShortlistItemJson;
  profile: PathJson | null;
  canSave: boolean;
  customer: PlannerCustomer | null;
  addressLabel: string | null;
  position: LatLon;
  kit: KitForm;
  antennas: AntennaJson[];
}) {
  const { item, profile } = props;
  return (
    <section className="card min-w-0" aria-labelledby="candidate-heading" data-testid="candidate-detail">
      <div className="flex flex-wrap items-baseline gap-2">
        <h2 id="candidate-heading">
          {item.mast.name}: {item.operator.name} {item.tech.toUpperCase()} {item.band}
        </h2>
        <GradeBadge grade={item.grade} prefix="RSRP" />
        {item.sinr_grade && <GradeBadge grade={item.sinr_grade} prefix="SINR" />}
      </div>
      <p className="mt-1 text-sm text-ink-700" data-testid="candidate-aim">
        Aim {formatBearing(item.bearing_true_deg, 'true')} / {formatBearing(item.bearing_magnetic_deg, 'magnetic')} · tilt {formatTilt(item.elevation_deg)} ·{' '}
        {formatDistance(item.distance_m)} · {item.tech.toUpperCase()} {item.band} ch {item.channel} ({formatMhz(item.freq_mhz)}) PCI {item.pci ?? MISSING}
      </p>
      <p className="mt-1 text-sm text-ink-700" data-testid="candidate-quality">
        SINR {formatDb(item.sinr_db)} ({item.interferers} co-channel cell{item.interferers === 1 ? '' : 's'} counted) · expected up to{' '}
        {formatMbps(item.expected_throughput_mbps)} on {item.bandwidth_mhz} MHz, shared with other users · {describeConfidence(item.calibration)}
      </p>
      <div className="mt-3 grid gap-4 xl:grid-cols-[1fr_18rem]">
        <div className="min-w-0">
          <h3 className="mb-1 text-sm font-semibold">Terrain profile</h3>
          {profile ? <TerrainChart path={profile} /> : <p className="text-sm text-ink-500">Loading the profile…</p>}
        </div>
        <div>
          <h3 className="mb-1 text-sm font-semibold">Link budget</h3>
          <table className="w-full text-sm" data-testid="budget">
            <tbody>
              {item.budget
                .filter((t) => t.db !== 0)
                .map((t) => (
                  <tr key={t.key} className="border-b border-ink-100">
                    <td className="py-1 pr-2 text-ink-700">{t.label}</td>
                    <td className="py-1 text-right tabular-nums">{formatDb(t.db, { signed: true })}</td>
                  </tr>
                ))}
              <tr>
                <td className="py-1 pr-2 font-semibold">Predicted RSRP</td>
                <td className="py-1 text-right font-semibold tabular-nums">{formatDbm(item.predicted_rsrp_dbm, 1)}</td>
              </tr>
            </tbody>
          </table>
          <p className="mt-2 text-xs text-ink-600">
            Terrain: {TERRAIN_LABELS[item.terrain.status]}.{' '}
            {item.calibration
              ? `Readings nearby: ${item.calibration.readings_used}, median residual ${item.calibration.median_residual_db} dB, ${Math.round(item.calibration.weight * 100)} % of it applied (${item.calibration.residual_db > 0 ? '+' : ''}${item.calibration.residual_db} dB).`
              : 'No readings of this cell nearby: model only.'}
          </p>
          {item.warnings.length > 0 && (
            <ul className="mt-2 list-disc pl-4 text-xs text-ember-700">
              {item.warnings.map((w) => (
                <li key={w}>{w}</li>
              ))}
            </ul>
          )}
        </div>
      </div>
      {props.canSave && <SavePlan {...props} />}
    </section>
  );
}

/** The server's message plus its field problems, in words a planner reads. */
function describeSaveError(error: { message: string; fields: Record<string, string[]> }): string {
  const details = Object.values(error.fields).flat();
  return details.length ? `${error.message}: ${details.join('; ')}` : error.message;
}

function SavePlan({
  item,
  customer,
  addressLabel,
  position,
  kit,
}: {
  item: ShortlistItemJson;
  customer: PlannerCustomer | null;
  addressLabel: string | null;
  position: LatLon;
  kit: KitForm;
}) {
  const kitValid = Object.keys(checkKitForm(kit)).length === 0;
  const [name, setName] = useState('');
  const saving = useSubmit({ failed: 'Could not save the plan' });
  // Stays busy after the plan is saved, while the aim sheet opens.
  const [leaving, setLeaving] = useState(false);
  const busy = saving.pending || leaving;
  const error = saving.error;
  const nameError = saving.fields['customer.name']?.[0];

  async function save() {
    const who = customer
      ? { customer_id: customer.id }
      : {
          customer: {
            name: name.trim(),
            address_label: addressLabel ?? formatLatLon(position.lat, position.lon),
            lat: position.lat,
            lon: position.lon,
          },
        };
    // One request: the new customer and the plan are saved together or not at all, and the server
    // computes the plan's figures from the same kit the shortlist used.
    const saved = await saving.submit(() =>
      plansApi.create({
        ...who,
        cell_id: item.cell_id,
        antenna_id: kit.antennaId,
        cable_id: kit.cableId || null,
        cable_m: kit.cableId ? readMetres(kit.cableM) : null,
        mount_height_m: readMetres(kit.heightM),
        state: 'planned',
      }),
    );
    if (saved.ok) {
      setLeaving(true);
      window.location.assign(`/plans/${saved.data.id}/sheet`);
    }
  }

  return (
    <form
      className="mt-4 flex flex-wrap items-end gap-3 border-t border-ink-100 pt-4"
      onSubmit={(e) => {
        e.preventDefault();
        void save();
      }}
    >
      {!customer && (
        <div className="min-w-56 flex-1">
          <label htmlFor="plan-customer-name" className="field-label">
            New customer’s name
          </label>
          <input id="plan-customer-name" className="field-input" value={name} onChange={(e) => setName(e.target.value)} aria-invalid={!!nameError} required />
          {nameError && <p className="field-error">{nameError}</p>}
        </div>
      )}
      <button type="submit" className="btn-primary" disabled={busy || !kitValid || (!customer && !name.trim())}>
        {busy ? 'Saving…' : 'Save plan and open the aim sheet'}
      </button>
      {error && !nameError && (
        <p role="alert" className="field-error w-full">
          {describeSaveError(error)}
        </p>
      )}
    </form>
  );
}
