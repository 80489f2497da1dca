import { FOOT_M } from './units';
import { GrazingInputError } from './grazing/errors';

// Great-circle distance on a sphere, by the haversine formula (well conditioned for short distances, where
// the spherical law of cosines loses digits). The sphere's radius is the mean Earth radius
// R₁ = (2a + b) / 3 of the WGS 84 ellipsoid = 6 371 008.8 m (IUGG convention; the same radius @turf uses).
// On the real ellipsoid distances differ by up to about 0.5 %: plenty for "how far do I truck the flock",
// not for surveying. Miles are international miles (5 280 ft × 0.3048 m = 1 609.344 m).

export const MEAN_EARTH_RADIUS_M = 6_371_008.8;
export const METERS_PER_MILE = 5280 * FOOT_M;

export interface LatLng {
  latitude: number;
  longitude: number;
}

function checkPoint(p: LatLng, field: string): void {
  const okLat = typeof p?.latitude === 'number' && Number.isFinite(p.latitude) && p.latitude >= -90 && p.latitude <= 90;
  if (!okLat) throw new GrazingInputError(`${field}.latitude`, 'Latitude must be between -90 and 90');
  const okLng = typeof p.longitude === 'number' && Number.isFinite(p.longitude) && p.longitude >= -180 && p.longitude <= 180;
  if (!okLng) throw new GrazingInputError(`${field}.longitude`, 'Longitude must be between -180 and 180');
}

const RAD = Math.PI / 180;

/** Central angle between two points, in radians. */
export function centralAngle(a: LatLng, b: LatLng): number {
  checkPoint(a, 'from');
  checkPoint(b, 'to');
  const φ1 = a.latitude * RAD;
  const φ2 = b.latitude * RAD;
  const dφ = φ2 - φ1;
  const dλ = (b.longitude - a.longitude) * RAD;
  const h = Math.sin(dφ / 2) ** 2 + Math.cos(φ1) * Math.cos(φ2) * Math.sin(dλ / 2) ** 2;
  // min(1, …) keeps rounding from pushing antipodal points past asin's domain.
  return 2 * Math.asin(Math.min(1, Math.sqrt(h)));
}

export function distanceMeters(a: LatLng, b: LatLng): number {
  return centralAngle(a, b) * MEAN_EARTH_RADIUS_M;
}

export function distanceKm(a: LatLng, b: LatLng): number {
  return distanceMeters(a, b) / 1000;
}

export function distanceMiles(a: LatLng, b: LatLng): number {
  return distanceMeters(a, b) / METERS_PER_MILE;
}

/** Earth's mean radius in international miles. */
export const MEAN_EARTH_RADIUS_MILES = MEAN_EARTH_RADIUS_M / METERS_PER_MILE;

export interface LatLngBox {
  latMin: number;
  latMax: number;
  /** One range, or two when the box crosses the antimeridian (±180°); empty when every longitude is in. */
  lngRanges: Array<[number, number]>;
}

/**
 * A latitude/longitude box that holds every point within `miles` of `center` (a cheap prefilter for an index;
 * the exact great-circle distance decides). The longitude half-width is asin(sin δ / cos φ) for an angular
 * radius δ at latitude φ: the meridians tangent to the circle, by the spherical law of sines. When the circle
 * reaches a pole every longitude is in. δ is widened by a millionth so that rounding never drops a point on
 * the circle. Null when the circle covers the whole sphere.
 */
export function boundingBox(center: LatLng, miles: number): LatLngBox | null {
  checkPoint(center, 'center');
  const delta = (miles / MEAN_EARTH_RADIUS_MILES) * (1 + 1e-6) + 1e-12;
  if (!(delta < Math.PI)) return null;
  const deg = 180 / Math.PI;
  const latMin = center.latitude - delta * deg;
  const latMax = center.latitude + delta * deg;
  const φ = center.latitude * RAD;
  if (latMax >= 90 || latMin <= -90 || Math.sin(delta) >= Math.cos(φ)) {
    return { latMin: Math.max(-90, latMin), latMax: Math.min(90, latMax), lngRanges: [] };
  }
  const half = Math.asin(Math.sin(delta) / Math.cos(φ)) * deg;
  const west = center.longitude - half;
  const east = center.longitude + half;
  if (west < -180) return { latMin, latMax, lngRanges: [[west + 360, 180], [-180, east]] };
  if (east > 180) return { latMin, latMax, lngRanges: [[west, 180], [-180, east - 360]] };
  return { latMin, latMax, lngRanges: [[west, east]] };
}
