import { PROVENANCE_NAMESPACE, type ProvAgent, type ProvenanceRecord } from './provenance.schema';

/**
 * Provenance records as one W3C PROV-JSON document (the layout of the PROV-JSON member
 * submission): a `prefix` map, then one map per kind of element and relation, keyed by
 * identifier. Relations have no identifiers of their own, so they get blank nodes numbered in log
 * order (_:u1, _:g1, _:a1, _:d1, …), and the same records always give the same document.
 */

/** A typed literal, as PROV-JSON writes qualified names given as values. */
export interface ProvJsonTypedValue {
  $: string;
  type: string;
}
export type ProvJsonValue = string | number | boolean | ProvJsonTypedValue;
export type ProvJsonAttributes = Record<string, ProvJsonValue>;

export interface ProvJsonDocument {
  prefix: Record<string, string>;
  entity: Record<string, ProvJsonAttributes>;
  activity: Record<string, ProvJsonAttributes>;
  agent: Record<string, ProvJsonAttributes>;
  used: Record<string, ProvJsonAttributes>;
  wasGeneratedBy: Record<string, ProvJsonAttributes>;
  wasAssociatedWith: Record<string, ProvJsonAttributes>;
  wasDerivedFrom: Record<string, ProvJsonAttributes>;
}

const AGENT_TYPES: Record<ProvAgent['kind'], string> = {
  person: 'prov:Person',
  software: 'prov:SoftwareAgent',
  organization: 'prov:Organization',
};

/** Record attributes are Localis terms; a name that is already qualified is kept as it is. */
export function provAttributeName(name: string): string {
  return name.includes(':') ? name : `localis:${name}`;
}

function qualifiedNameValue(name: string): ProvJsonTypedValue {
  return { $: name, type: 'xsd:QName' };
}

/**
 * Several records naming the same node give one element: labels, times and attributes from later
 * records win (they describe it more recently), and nothing is dropped for being absent later.
 * The same relation logged twice is written once.
 */
export function toProvJson(records: readonly ProvenanceRecord[]): ProvJsonDocument {
  const doc: ProvJsonDocument = {
    prefix: { localis: PROVENANCE_NAMESPACE },
    entity: {},
    activity: {},
    agent: {},
    used: {},
    wasGeneratedBy: {},
    wasAssociatedWith: {},
    wasDerivedFrom: {},
  };
  const relations = {
    used: new RelationMap(doc.used, 'u'),
    wasGeneratedBy: new RelationMap(doc.wasGeneratedBy, 'g'),
    wasAssociatedWith: new RelationMap(doc.wasAssociatedWith, 'a'),
    wasDerivedFrom: new RelationMap(doc.wasDerivedFrom, 'd'),
  };

  for (const record of records) {
    for (const entity of record.entities) mergeElement(doc.entity, entity.id, { 'prov:label': entity.label }, entity.attributes);
    for (const activity of record.activities) {
      const times: ProvJsonAttributes = { 'prov:label': activity.label };
      if (activity.startedAt !== undefined) times['prov:startTime'] = activity.startedAt;
      if (activity.endedAt !== undefined) times['prov:endTime'] = activity.endedAt;
      mergeElement(doc.activity, activity.id, times, activity.attributes);
    }
    for (const agent of record.agents) {
      mergeElement(doc.agent, agent.id, { 'prov:label': agent.label, 'prov:type': qualifiedNameValue(AGENT_TYPES[agent.kind]) }, agent.attributes);
    }
    for (const u of record.used) relations.used.add({ 'prov:activity': u.activity, 'prov:entity': u.entity });
    for (const g of record.wasGeneratedBy) relations.wasGeneratedBy.add({ 'prov:entity': g.entity, 'prov:activity': g.activity });
    for (const a of record.wasAssociatedWith) {
      const association: ProvJsonAttributes = { 'prov:activity': a.activity, 'prov:agent': a.agent };
      if (a.role !== undefined) association['prov:role'] = a.role;
      relations.wasAssociatedWith.add(association);
    }
    for (const d of record.wasDerivedFrom) relations.wasDerivedFrom.add({ 'prov:generatedEntity': d.generated, 'prov:usedEntity': d.used });
  }
  return doc;
}

function mergeElement(map: Record<string, ProvJsonAttributes>, id: string, core: ProvJsonAttributes, attributes: Record<string, string | number | boolean>): void {
  const element = (map[id] ??= {});
  Object.assign(element, core);
  for (const [name, value] of Object.entries(attributes)) element[provAttributeName(name)] = value;
}

/** One relation map with its blank-node counter; identical relations share one blank node. */
class RelationMap {
  private readonly seen = new Set<string>();
  private count = 0;

  constructor(
    private readonly target: Record<string, ProvJsonAttributes>,
    private readonly letter: string,
  ) {}

  add(relation: ProvJsonAttributes): void {
    const key = JSON.stringify(relation);
    if (this.seen.has(key)) return;
    this.seen.add(key);
    this.target[`_:${this.letter}${++this.count}`] = relation;
  }
}
