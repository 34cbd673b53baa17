/**
 * A level's plan image in Leaflet with CRS.Simple: one map unit is one pixel of the ORIGINAL image,
 * whichever copy (device-sized or original) is drawn, so clicks come back in original pixels — the
 * units the calibration and the server use. See ../plan-geometry.ts for the coordinate frames.
 */
import 'leaflet/dist/leaflet.css';
import L from 'leaflet';
import { useEffect, useLayoutEffect, useRef, useState, type ReactNode } from 'react';
import { ImageOverlay, MapContainer, useMap, useMapEvents } from 'react-leaflet';
import { formatLength } from '@shared/units';
import { imageBounds, latLngToPixel, niceScaleBar, type PixelPoint } from '../plan-geometry';

export interface PlanMapProps {
  imageUrl: string;
  widthPx: number;
  heightPx: number;
  /** Accessible name of the map region ("Plan of Ground floor"). */
  label: string;
  onPlanClick?: (point: PixelPoint) => void;
  /** Metres per image pixel; when set, a scale bar is drawn. */
  metresPerPixel?: number | null;
  /**
   * A click will place something: crosshair cursor, and the whole plan is scrolled into view (the
   * buttons that start picking can sit below a tall map, leaving part of the plan off-screen).
   */
  picking?: boolean;
  /** What a click on the plan does now, shown in a bar on top of the map (inside the scrolled region). */
  prompt?: ReactNode;
  children?: ReactNode;
  className?: string;
}

function ClickCatcher({ onPlanClick }: { onPlanClick: (point: PixelPoint) => void }) {
  useMapEvents({ click: (event) => onPlanClick(latLngToPixel(event.latlng)) });
  return null;
}

const SCALE_BAR_MAX_PX = 160;

/** A scale bar for the current zoom: in CRS.Simple a screen pixel is 2^-zoom image pixels. */
function ScaleBar({ metresPerPixel }: { metresPerPixel: number }) {
  const map = useMap();
  const [zoom, setZoom] = useState(() => map.getZoom());
  useMapEvents({ zoomend: () => setZoom(map.getZoom()) });
  const bar = niceScaleBar(metresPerPixel / 2 ** zoom, SCALE_BAR_MAX_PX);
  if (!bar) return null;
  return (
    <div className="pointer-events-none absolute bottom-2 left-2 z-[1000] rounded bg-surface/90 px-2 py-1 text-sm font-bold text-fg" data-testid="scale-bar">
      <div className="h-2 border-x-2 border-b-2 border-fg" style={{ width: `${bar.pixels}px` }} aria-hidden="true" />
      <span>{formatLength(bar.lengthM, { significantDigits: 2 })}</span>
    </div>
  );
}

/**
 * Shows the whole plan: at first, for a new image, and again when the map's WIDTH changes (a phone
 * turned, a window resized) — not on height changes alone, which is a phone's keyboard opening while
 * someone types a distance and should not throw away their zoom.
 */
function Fit({ widthPx, heightPx }: { widthPx: number; heightPx: number }) {
  const map = useMap();
  useEffect(() => {
    const bounds = imageBounds(widthPx, heightPx);
    map.fitBounds(bounds);
    const container = map.getContainer();
    let fittedWidth = container.clientWidth;
    const observer = new ResizeObserver(() => {
      if (container.clientWidth === fittedWidth || container.clientWidth === 0) return;
      fittedWidth = container.clientWidth;
      map.invalidateSize({ pan: false });
      // No animation: the drawn outlines and markers must land with the image, not a frame later.
      map.fitBounds(bounds, { animate: false });
    });
    observer.observe(container);
    return () => observer.disconnect();
  }, [map, widthPx, heightPx]);
  return null;
}

export function PlanMap({ imageUrl, widthPx, heightPx, label, onPlanClick, metresPerPixel, picking, prompt, children, className = '' }: PlanMapProps) {
  const bounds = imageBounds(widthPx, heightPx);
  const regionRef = useRef<HTMLDivElement>(null);
  // Layout effect: the scroll lands in the same frame as the click that started picking, so the
  // next click (by a person or a test) meets the plan where it is drawn.
  useLayoutEffect(() => {
    if (picking) regionRef.current?.scrollIntoView({ block: 'nearest', behavior: 'instant' });
  }, [picking]);
  // `isolate`: Leaflet's panes and controls carry z-index 400–1000; in a stacking context of their
  // own they stay under the app's toasts (z-50) instead of covering them while a plan is on screen.
  return (
    <div
      ref={regionRef}
      role="region"
      aria-label={label}
      className={`relative isolate overflow-hidden rounded-xl border-2 border-border ${picking ? '[&_.leaflet-container]:cursor-crosshair' : ''} ${className}`}
    >
      {prompt !== undefined && (
        <div role="status" className="min-h-touch border-b-2 border-border bg-accent-soft px-4 py-2 text-accent-soft-fg">
          {prompt}
        </div>
      )}
      <MapContainer
        crs={L.CRS.Simple}
        bounds={bounds}
        minZoom={-6}
        maxZoom={4}
        zoomSnap={0.25}
        attributionControl={false}
        className="h-[60vh] min-h-80 w-full bg-surface-sunken"
      >
        <ImageOverlay url={imageUrl} bounds={bounds} />
        <Fit widthPx={widthPx} heightPx={heightPx} />
        {onPlanClick && <ClickCatcher onPlanClick={onPlanClick} />}
        {metresPerPixel ? <ScaleBar metresPerPixel={metresPerPixel} /> : null}
        {children}
      </MapContainer>
    </div>
  );
}
