import { useEffect, useMemo, useState } from 'react';
import { ApiError } from '../../lib/client/api';
import type { PathResult } from '../../lib/client/tools-api';
import {
  plannerApi,
  planSaveApi,
  type AntennaOption,
  type CableOption,
  type OperatorOption,
  type Shortlist,
  type ShortlistItem,
} from '../../lib/client/planner-api';
import type { LatLon } from '../../lib/domain/geodesy';
import { useDebounced } from '../tools/useDebounced';
import AddressSearch from './AddressSearch';
import PlannerMap from './PlannerMap';
import ShortlistTable from './ShortlistTable';
import TerrainChart from './TerrainChart';
import { GradeBadge, TERRAIN_LABELS } from './grades';

export interface PlannerCustomer {
  id: string;
  name: string;
  addressLabel: string | null;
  lat: number | null;
  lon: number | null;
  currentAntennaId: string | null;
}

interface Props {
  customer: PlannerCustomer | null;
  canSave: boolean;
}

interface KitForm {
  antennaId: string;
  cableId: string;
  cableM: string;
  heightM: string;
  operator: string;
}

export default function PlannerApp({ customer, canSave }: Props) {
  const [position, setPosition] = useState<LatLon | null>(customer?.lat != null && customer.lon != null ? { lat: customer.lat, lon: customer.lon } : null);
  const [addressLabel, setAddressLabel] = useState<string | null>(customer?.addressLabel ?? null);
  const [antennas, setAntennas] = useState<AntennaOption[]>([]);
  const [cables, setCables] = useState<CableOption[]>([]);
  const [operators, setOperators] = useState<OperatorOption[]>([]);
  const [kit, setKit] = useState<KitForm>({ antennaId: '', cableId: '', cableM: '10', heightM: '6', operator: '' });
  const [shortlist, setShortlist] = useState<Shortlist | null>(null);
  const [loading, setLoading] = useState(false);
  const [error, setError] = useState<{ message: string; fields: Record<string, string[]> } | null>(null);
  const [selected, setSelected] = useState<string | null>(null);
  const [profile, setProfile] = useState<PathResult | null>(null);

  useEffect(() => {
    Promise.all([plannerApi.antennas(), plannerApi.cables(), plannerApi.operators()]).then(
      ([a, c, o]) => {
        setAntennas(a.items);
        setCables(c.items);
        setOperators(o.items);
        const directional = a.items.find((x) => x.kind === 'directional') ?? a.items[0];
        setKit((k) => ({ ...k, antennaId: directional?.id ?? '', cableId: c.items[0]?.id ?? '' }));
      },
      (e: unknown) => setError({ message: e instanceof ApiError ? e.message : 'Could not load the catalogue', fields: {} }),
    );
  }, []);

  const request = useDebounced(position && kit.antennaId ? JSON.stringify({ ...position, ...kit }) : null, 300);
  useEffect(() => {
    if (!request) return;
    const p = JSON.parse(request) as LatLon & KitForm;
    let live = true;
    setLoading(true);
    plannerApi
      .shortlist({ lat: p.lat, lon: p.lon, height_m: p.heightM, antenna_id: p.antennaId, cable_id: p.cableId, cable_m: p.cableM, operator: p.operator, current_antenna_id: customer?.currentAntennaId ?? '' })
      .then(
        (s) => {
          if (!live) return;
          setShortlist(s);
          setError(null);
          setSelected((cur) => (cur && s.items.some((i) => i.cell_id === cur) ? cur : (s.items[0]?.cell_id ?? null)));
        },
        (e: unknown) => live && setError(e instanceof ApiError ? { message: e.message, fields: e.fields } : { message: 'Could not build the shortlist', fields: {} }),
      )
      .finally(() => live && setLoading(false));
    return () => {
      live = false;
    };
  }, [request, customer?.currentAntennaId]);

  const chosen = useMemo(() => shortlist?.items.find((i) => i.cell_id === selected) ?? null, [shortlist, selected]);

  useEffect(() => {
    setProfile(null);
    if (!chosen || !position) return;
    let live = true;
    plannerApi.profile(position, chosen, kit.heightM).then((p) => live && setProfile(p), () => live && setProfile(null));
    return () => {
      live = false;
    };
    // Keyed on the cell and the position's values: a new object for the same place asks nothing new.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [chosen?.cell_id, position?.lat, position?.lon, kit.heightM]);

  const fieldError = (k: string) => error?.fields[k]?.[0];
  const setK = (patch: Partial<KitForm>) => setKit((k) => ({ ...k, ...patch }));

  return (
    <div className="grid gap-4 lg:grid-cols-[22rem_1fr]">
      <aside className="space-y-4">
        <section className="card space-y-3" aria-labelledby="where-heading">
          <h2 id="where-heading">Where</h2>
          {customer && <p className="text-sm">Planning for <a className="font-semibold underline" href={`/customers/${customer.id}`}>{customer.name}</a></p>}
          <AddressSearch
            onPick={(m) => {
              setPosition({ lat: m.lat, lon: m.lon });
              setAddressLabel(m.kind === 'address' ? m.label : null);
            }}
          />
          <p className="text-xs text-ink-600" data-testid="plan-position">
            {position ? `Position ${position.lat.toFixed(5)}, ${position.lon.toFixed(5)}${shortlist?.customer_ground_m != null ? ` · ground ${shortlist.customer_ground_m} m` : ''}` : 'Search an address, type coordinates, or click the map.'}
          </p>
        </section>
        <section className="card" aria-labelledby="kit-heading">
          <h2 id="kit-heading">Kit</h2>
          <div className="mt-3 grid grid-cols-2 gap-3">
            <div className="col-span-2">
              <label htmlFor="kit-antenna" className="field-label">Antenna</label>
              <select id="kit-antenna" className="field-input" value={kit.antennaId} onChange={(e) => setK({ antennaId: e.target.value })}>
                {antennas.map((a) => <option key={a.id} value={a.id}>{a.name} ({a.kind}, {a.ports}-port)</option>)}
              </select>
            </div>
            <div className="col-span-2">
              <label htmlFor="kit-cable" className="field-label">Cable</label>
              <select id="kit-cable" className="field-input" value={kit.cableId} onChange={(e) => setK({ cableId: e.target.value })}>
                <option value="">None (antenna at the router)</option>
                {cables.map((c) => <option key={c.id} value={c.id}>{c.name}</option>)}
              </select>
            </div>
            <div>
              <label htmlFor="kit-length" className="field-label">Cable length (m)</label>
              <input id="kit-length" className="field-input" inputMode="decimal" value={kit.cableM} onChange={(e) => setK({ cableM: e.target.value })} aria-invalid={!!fieldError('cable_m')} />
              {fieldError('cable_m') && <p className="field-error">{fieldError('cable_m')}</p>}
            </div>
            <div>
              <label htmlFor="kit-height" className="field-label">Mount height (m)</label>
              <input id="kit-height" className="field-input" inputMode="decimal" value={kit.heightM} onChange={(e) => setK({ heightM: e.target.value })} aria-invalid={!!fieldError('height_m')} />
              {fieldError('height_m') && <p className="field-error">{fieldError('height_m')}</p>}
            </div>
            <div className="col-span-2">
              <label htmlFor="kit-operator" className="field-label">Preferred operator</label>
              <select id="kit-operator" className="field-input" value={kit.operator} onChange={(e) => setK({ operator: e.target.value })}>
                <option value="">No preference</option>
                {operators.map((o) => <option key={o.id} value={o.id}>{o.name}</option>)}
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
            }}
            onSelect={setSelected}
          />
        </div>
        {error && <p role="alert" className="rounded-md border border-alarm-100 bg-alarm-50 px-3 py-2 text-sm text-alarm-700">{error.message}</p>}
        <section className="card min-w-0" aria-labelledby="shortlist-heading" aria-busy={loading}>
          <div className="mb-2 flex flex-wrap items-baseline gap-2">
            <h2 id="shortlist-heading">Shortlist</h2>
            {shortlist && <span className="text-sm text-ink-600">{shortlist.total} cells within {(shortlist.radius_m / 1000).toFixed(0)} km · {shortlist.kit.antenna.name}{shortlist.kit.cable ? `, ${shortlist.kit.cable_m} m ${shortlist.kit.cable.name}` : ''}{shortlist.current_antenna ? ` · gain vs ${shortlist.current_antenna.name}` : ''}</span>}
            {loading && <span className="text-sm text-ink-500" role="status">Calculating…</span>}
          </div>
          {shortlist ? <ShortlistTable items={shortlist.items} selectedCellId={selected} onSelect={setSelected} /> : <p className="text-sm text-ink-600">The ranked candidates appear here once a position is set.</p>}
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
  item: ShortlistItem;
  profile: PathResult | null;
  canSave: boolean;
  customer: PlannerCustomer | null;
  addressLabel: string | null;
  position: LatLon;
  kit: KitForm;
  antennas: AntennaOption[];
}) {
  const { item, profile } = props;
  return (
    <section className="card min-w-0" aria-labelledby="candidate-heading" data-testid="candidate-detail">
      <div className="flex flex-wrap items-baseline gap-2">
        <h2 id="candidate-heading">{item.mast.name}: {item.operator.name} {item.tech.toUpperCase()} {item.band}</h2>
        <GradeBadge grade={item.grade} />
      </div>
      <p className="mt-1 text-sm text-ink-700" data-testid="candidate-aim">
        Aim {item.bearing_true_deg.toFixed(1)}° true / {item.bearing_magnetic_deg.toFixed(1)}° magnetic · tilt {item.elevation_deg >= 0 ? 'up' : 'down'} {Math.abs(item.elevation_deg).toFixed(2)}° · {(item.distance_m / 1000).toFixed(2)} km · {item.tech.toUpperCase()} {item.band} ch {item.channel} ({item.freq_mhz.toFixed(1)} MHz) PCI {item.pci ?? '—'}
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
              {item.budget.filter((t) => t.db !== 0).map((t) => (
                <tr key={t.key} className="border-b border-ink-100"><td className="py-1 pr-2 text-ink-700">{t.label}</td><td className="py-1 text-right tabular-nums">{t.db > 0 ? '+' : ''}{t.db.toFixed(1)} dB</td></tr>
              ))}
              <tr><td className="py-1 pr-2 font-semibold">Predicted RSRP</td><td className="py-1 text-right font-semibold tabular-nums">{item.predicted_rsrp_dbm.toFixed(1)} dBm</td></tr>
            </tbody>
          </table>
          <p className="mt-2 text-xs text-ink-600">Terrain: {TERRAIN_LABELS[item.terrain.status]}. {item.calibration ? `Calibrated by ${item.calibration.readings_used} readings (median residual ${item.calibration.residual_db} dB).` : 'No readings of this cell nearby: model only.'}</p>
          {item.warnings.length > 0 && <ul className="mt-2 list-disc pl-4 text-xs text-ember-700">{item.warnings.map((w) => <li key={w}>{w}</li>)}</ul>}
        </div>
      </div>
      {props.canSave && <SavePlan {...props} />}
    </section>
  );
}

function SavePlan({ item, customer, addressLabel, position, kit }: { item: ShortlistItem; customer: PlannerCustomer | null; addressLabel: string | null; position: LatLon; kit: KitForm }) {
  const [name, setName] = useState('');
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<{ message: string; fields: Record<string, string[]> } | null>(null);

  async function save() {
    setBusy(true);
    setError(null);
    try {
      const customerId = customer?.id ?? (await planSaveApi.createCustomer({ name: name.trim(), address_label: addressLabel ?? `${position.lat.toFixed(5)}, ${position.lon.toFixed(5)}`, lat: position.lat, lon: position.lon })).id;
      const plan = await planSaveApi.createPlan({
        customer_id: customerId,
        cell_id: item.cell_id,
        antenna_id: kit.antennaId,
        cable_id: kit.cableId || null,
        cable_m: kit.cableId ? Number(kit.cableM) : null,
        mount_height_m: Number(kit.heightM),
        figures: { ...item, customer_position: position },
        state: 'planned',
      });
      window.location.assign(`/plans/${plan.id}/sheet`);
    } catch (e) {
      setError(e instanceof ApiError ? { message: e.message, fields: e.fields } : { message: 'Could not save the plan', fields: {} });
      setBusy(false);
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
          <label htmlFor="plan-customer-name" className="field-label">New customer’s name</label>
          <input id="plan-customer-name" className="field-input" value={name} onChange={(e) => setName(e.target.value)} aria-invalid={!!error?.fields.name} required />
          {error?.fields.name && <p className="field-error">{error.fields.name[0]}</p>}
        </div>
      )}
      <button type="submit" className="btn-primary" disabled={busy || (!customer && !name.trim())}>{busy ? 'Saving…' : 'Save plan and open the aim sheet'}</button>
      {error && !error.fields.name && <p role="alert" className="field-error w-full">{error.message}</p>}
    </form>
  );
}
