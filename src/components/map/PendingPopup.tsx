import { Popup } from 'react-map-gl/maplibre';
import { SIGHTING_STRUCTURE_LABELS, type PendingSightingCollectionJson } from '../../lib/schemas/sightings';
import { formatDate } from '../../lib/domain/format';

export type PendingSightingFeature = PendingSightingCollectionJson['features'][number];

/** What the map shows about a pending sighting: only reviewers and its author see one. */
export default function PendingPopup({ sighting, onClose }: { sighting: PendingSightingFeature; onClose: () => void }) {
  return (
    <Popup
      longitude={sighting.geometry.coordinates[0]}
      latitude={sighting.geometry.coordinates[1]}
      anchor="bottom"
      offset={18}
      onClose={onClose}
      closeOnClick={false}
    >
      <div className="space-y-1 pr-4 text-sm text-ink-900" data-testid="pending-popup">
        <p className="font-semibold">Pending sighting</p>
        <p>
          {SIGHTING_STRUCTURE_LABELS[sighting.properties.structure_type]} · seen {formatDate(sighting.properties.observed_at)}
        </p>
        <p>by {sighting.properties.mine ? 'you' : sighting.properties.author_name}</p>
        <p className="text-xs text-ink-600">Waiting for a reviewer; only reviewers and its author see it.</p>
      </div>
    </Popup>
  );
}
