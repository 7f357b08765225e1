import { EXPORT_FORMATS, EXPORT_FORMAT_LABELS, EXPORT_LAYER_LABELS, type ExportLayer } from '../../lib/schemas/exports';
import { getExportUrl, type ExportFilter } from '../../lib/client/exports-api';

interface Props {
  layers: readonly ExportLayer[];
  filter?: ExportFilter;
  /** Said under the links, e.g. which filter applies. */
  note?: string;
}

/** Download links for layers in CSV, GeoJSON and KML, with the filter given. */
export default function ExportLinks({ layers, filter = {}, note }: Props) {
  return (
    <div className="space-y-1.5" data-testid="export-links">
      {layers.map((layer) => (
        <div key={layer} className="flex flex-wrap items-center gap-x-2 gap-y-1 text-sm">
          <span className="min-w-[9rem] font-semibold text-ink-800">{EXPORT_LAYER_LABELS[layer]}</span>
          {EXPORT_FORMATS.map((format) => (
            <a
              key={format}
              href={getExportUrl(layer, format, filter)}
              download
              className="rounded border border-ink-300 bg-white px-2.5 py-1 text-xs font-semibold text-ink-800 hover:bg-ink-100"
              data-testid={`export-${layer}-${format}`}
              aria-label={`${EXPORT_LAYER_LABELS[layer]} as ${EXPORT_FORMAT_LABELS[format]}`}
            >
              {EXPORT_FORMAT_LABELS[format]}
            </a>
          ))}
        </div>
      ))}
      {note && <p className="text-xs text-ink-600">{note}</p>}
    </div>
  );
}
