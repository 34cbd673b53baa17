// Geoman patches the global `L` when it loads (it has no ES import of leaflet), so the leaflet module
// react-leaflet uses must be on window first. Imported just before '@geoman-io/leaflet-geoman-free'.
import L from 'leaflet';

(window as unknown as { L: typeof L }).L = L;
