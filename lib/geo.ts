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
