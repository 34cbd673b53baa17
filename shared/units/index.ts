/** Fringewalk units: strict parsing and formatting of the quantities a surveyor types (SI inside). */
export * from './units';
export * from './schemas';
export { PhysicsInputError, isPhysicsInputError, type PhysicsInputErrorCode } from '../physics/errors';
