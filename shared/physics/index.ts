/**
 * Fringewalk physics core: constants (CODATA 2018), species, kinematics, cyclotron lines, emission,
 * spectrum-analyser arithmetic, watch-band overlap, safety classes, field maps, dipole fits, repeat
 * readings and the Earth's background field. Pure TypeScript: no DOM, no Node APIs.
 * Every public function validates its inputs and throws PhysicsInputError (errors.ts) on bad ones.
 */
export * from './errors';
export * from './constants';
export * from './species';
export * from './kinematics';
export * from './lines';
export * from './bands';
export * from './emission';
export * from './analyser';
export * from './safety';
export * from './field-grid';
export * from './dipole';
export * from './repeats';
export * from './background';
