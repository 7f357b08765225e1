import { useEffect } from 'react';
import { useMap } from 'react-map-gl/maplibre';
import { MAST_ICON_PIXEL_RATIO, isMastIconId, mastIconImage, type OperatorMark } from './mast-icons';

/** Supplies mast marks to MapLibre as their image ids are first needed. */
export default function MastImages({ operators }: { operators: readonly OperatorMark[] }) {
  const { current } = useMap();
  useEffect(() => {
    const map = current?.getMap();
    if (!map) return;
    const onMissing = (e: { id: string }) => {
      if (map.hasImage(e.id)) return;
      const image = mastIconImage(e.id, operators);
      if (image) map.addImage(e.id, image, { pixelRatio: MAST_ICON_PIXEL_RATIO });
    };
    // Colours may have changed since the marks were drawn.
    for (const id of map.listImages()) {
      if (!isMastIconId(id)) continue;
      const image = mastIconImage(id, operators);
      if (image) map.updateImage(id, image);
    }
    map.on('styleimagemissing', onMissing);
    return () => {
      map.off('styleimagemissing', onMissing);
    };
  }, [current, operators]);
  return null;
}
