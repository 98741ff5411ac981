import type { InstitutionKind, Role } from '@localis/shared';

/**
 * The demo scenario: the fictional Coldwater Localization Network. Every id is fixed so loading
 * it twice changes nothing and so links to demo records stay valid between starts.
 * Names, institutions and addresses are invented.
 */
export const DEMO_PASSWORD = 'coldwater';

export interface ScenarioInstitution {
  id: string;
  name: string;
  kind: InstitutionKind;
  country: string;
  billingEmail: string | null;
}

export interface ScenarioPerson {
  id: string;
  name: string;
  email: string;
  institutionId: string;
  roles: Role[];
  /** What the person does in the story, printed beside the demo sign-ins. */
  story: string;
}

export interface ScenarioGroup {
  id: string;
  name: string;
  institutionId: string;
  piPersonId: string;
  memberIds: string[];
}

const BRENNMOOR = '1a000000-0000-4000-8000-000000000001';
const KESTREL = '1a000000-0000-4000-8000-000000000002';
const ORRIN = '1a000000-0000-4000-8000-000000000003';

export const INSTITUTIONS: ScenarioInstitution[] = [
  { id: BRENNMOOR, name: 'Brennmoor Institute of Lattice Physics', kind: 'member', country: 'DE', billingEmail: null },
  { id: KESTREL, name: 'Kestrel University', kind: 'member', country: 'GB', billingEmail: null },
  { id: ORRIN, name: 'Orrin Quantum Devices Ltd.', kind: 'partner', country: 'NL', billingEmail: 'accounts@orrin-qd.example' },
];

const person = (n: number) => `2b000000-0000-4000-8000-${String(n).padStart(12, '0')}`;

export const PEOPLE: ScenarioPerson[] = [
  { id: person(1), name: 'Dana Whitfield', email: 'dana.whitfield@coldwater-network.example', institutionId: KESTREL, roles: ['admin'], story: 'consortium office' },
  { id: person(2), name: 'Tobias Wendt', email: 'tobias.wendt@brennmoor.example', institutionId: BRENNMOOR, roles: ['pi', 'researcher'], story: 'PI, Disordered Lattices group' },
  { id: person(3), name: 'Ines Albrecht', email: 'ines.albrecht@brennmoor.example', institutionId: BRENNMOOR, roles: ['researcher'], story: 'PhD student, Disordered Lattices group' },
  { id: person(4), name: 'Mara Okonkwo', email: 'mara.okonkwo@kestrel.example', institutionId: KESTREL, roles: ['pi', 'researcher'], story: 'PI, Quantum Transport group' },
  { id: person(5), name: 'Priya Raman', email: 'priya.raman@kestrel.example', institutionId: KESTREL, roles: ['researcher'], story: 'postdoc, Quantum Transport group' },
  { id: person(6), name: 'Henrik Solberg', email: 'henrik.solberg@kestrel.example', institutionId: KESTREL, roles: ['committee'], story: 'allocation committee' },
  { id: person(7), name: 'Aiko Tanaka', email: 'aiko.tanaka@brennmoor.example', institutionId: BRENNMOOR, roles: ['committee', 'researcher'], story: 'allocation committee' },
  { id: person(8), name: 'Sofia Lindqvist', email: 'sofia.lindqvist@orrin-qd.example', institutionId: ORRIN, roles: ['pi', 'researcher'], story: 'PI, Device Modelling group (partner)' },
  { id: person(9), name: 'Felix Marlow', email: 'felix.marlow@orrin-qd.example', institutionId: ORRIN, roles: ['billing'], story: 'billing contact at the partner' },
  // A second member from Brennmoor: the Quantum Transport proposals (Kestrel) need two reviewers
  // from outside Kestrel, and Henrik Solberg may not review them.
  { id: person(10), name: 'Elena Marchetti', email: 'elena.marchetti@brennmoor.example', institutionId: BRENNMOOR, roles: ['committee'], story: 'allocation committee' },
];

export const GROUPS: ScenarioGroup[] = [
  { id: '3c000000-0000-4000-8000-000000000001', name: 'Disordered Lattices', institutionId: BRENNMOOR, piPersonId: person(2), memberIds: [person(2), person(3)] },
  { id: '3c000000-0000-4000-8000-000000000002', name: 'Quantum Transport', institutionId: KESTREL, piPersonId: person(4), memberIds: [person(4), person(5)] },
  { id: '3c000000-0000-4000-8000-000000000003', name: 'Device Modelling', institutionId: ORRIN, piPersonId: person(8), memberIds: [person(8)] },
];

/** A person the identity provider knows but Localis does not: shows the "not a member yet" page. */
export const OUTSIDER = { name: 'Rhea Castellan', email: 'rhea.castellan@elsewhere.example' };
