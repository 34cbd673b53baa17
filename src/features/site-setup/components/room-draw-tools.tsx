/**
 * Room outlines drawn and edited with Geoman (a Leaflet drawing plugin), driven imperatively through
 * react-leaflet's useMap: Geoman's layers live only while drawing or editing; the saved rooms are
 * plain react-leaflet polygons rendered from server data.
 */
import './leaflet-global';
import '@geoman-io/leaflet-geoman-free';
import '@geoman-io/leaflet-geoman-free/dist/leaflet-geoman.css';
import L from 'leaflet';
import { useEffect } from 'react';
import { useMap } from 'react-leaflet';
import { latLngToPixel, pixelToLatLng, type PixelPoint } from '../plan-geometry';

const DRAW_STYLE = { color: '#a15726', weight: 3, fillOpacity: 0.15 };

function ringPixels(layer: L.Polygon): PixelPoint[] {
  const rings = layer.getLatLngs() as L.LatLng[][];
  return (rings[0] ?? []).map((latLng) => latLngToPixel(latLng));
}

/** While mounted, a click adds a corner; clicking the first corner again closes the outline. */
export function RoomDrawTool({ onDrawn }: { onDrawn: (outline: PixelPoint[]) => void }) {
  const map = useMap();
  useEffect(() => {
    const onCreate = (event: { layer: L.Layer }) => {
      const layer = event.layer as L.Polygon;
      const outline = ringPixels(layer);
      layer.remove();
      onDrawn(outline);
    };
    map.on('pm:create', onCreate);
    map.pm.enableDraw('Polygon', { templineStyle: DRAW_STYLE, hintlineStyle: { ...DRAW_STYLE, dashArray: '5 5' }, pathOptions: DRAW_STYLE, allowSelfIntersection: false });
    return () => {
      map.off('pm:create', onCreate);
      map.pm.disableDraw();
    };
  }, [map, onDrawn]);
  return null;
}

/** While mounted, the outline's corners can be dragged (and corners added from the mid-points). */
export function RoomEditTool({ outline, onChange }: { outline: PixelPoint[]; onChange: (outline: PixelPoint[]) => void }) {
  const map = useMap();
  useEffect(() => {
    const layer = L.polygon(outline.map(pixelToLatLng), DRAW_STYLE).addTo(map);
    layer.pm.enable({ allowSelfIntersection: false });
    const report = () => onChange(ringPixels(layer));
    layer.on('pm:edit', report);
    return () => {
      layer.off('pm:edit', report);
      layer.pm.disable();
      layer.remove();
    };
    // The outline seeds the editor once per room; later changes come from the editor itself.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [map]);
  return null;
}
