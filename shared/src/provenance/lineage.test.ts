import { describe, expect, it } from 'vitest';
import { EXAMPLE_CAMPAIGN_ID, exampleIds as id, exampleRecords } from './provenance-example.fixture';
import type { ProvenanceRecord } from './provenance.schema';
import { layerNodes, lineageGraph, subtypeOf, type LineageGraph } from './lineage';

describe('lineageGraph on the worked example', () => {
  const graph = lineageGraph(exampleRecords, id.archive);

  it('walks from the archive back to its runs, code, people, grant and campaign', () => {
    expect(graph.nodes).toEqual([
      { id: id.archive, label: 'results-W16.5.tar.gz', type: 'entity', subtype: 'archive' },
      { id: id.run1, label: 'Run L=12, W=16.5', type: 'entity', subtype: 'run' },
      { id: id.run2, label: 'Run L=16, W=16.5', type: 'entity', subtype: 'run' },
      { id: id.upload, label: 'Upload and verification', type: 'activity', subtype: 'upload' },
      { id: id.simulation1, label: 'Transfer-matrix simulation L=12', type: 'activity', subtype: 'simulation' },
      { id: id.simulation2, label: 'Transfer-matrix simulation L=16', type: 'activity', subtype: 'simulation' },
      { id: id.researcher, label: 'Mateo Lindqvist', type: 'agent', subtype: 'person' },
      { id: id.verifier, label: 'localis-verifier 1.0.0', type: 'agent', subtype: 'code' },
      { id: id.grant, label: 'Grant of 500000 core-hours', type: 'entity', subtype: 'grant' },
      { id: id.solver, label: 'transfer-matrix 2.1.0', type: 'agent', subtype: 'code' },
      { id: id.decision, label: 'Allocation decision, round 2026-B', type: 'activity', subtype: 'grant-decision' },
      { id: id.campaign, label: 'Critical exponent of the 3D Anderson transition', type: 'entity', subtype: 'campaign' },
      { id: id.chair, label: 'Ines Okafor', type: 'agent', subtype: 'person' },
      { id: id.committee, label: 'Allocation committee', type: 'agent', subtype: 'organization' },
    ]);
    expect(graph.edges).toEqual([
      { from: id.archive, to: id.run1, relation: 'wasDerivedFrom' },
      { from: id.archive, to: id.run2, relation: 'wasDerivedFrom' },
      { from: id.archive, to: id.upload, relation: 'wasGeneratedBy' },
      { from: id.run1, to: id.simulation1, relation: 'wasGeneratedBy' },
      { from: id.run2, to: id.simulation2, relation: 'wasGeneratedBy' },
      { from: id.upload, to: id.researcher, relation: 'wasAssociatedWith' },
      { from: id.upload, to: id.verifier, relation: 'wasAssociatedWith' },
      { from: id.simulation1, to: id.grant, relation: 'used' },
      { from: id.simulation1, to: id.solver, relation: 'wasAssociatedWith' },
      { from: id.simulation1, to: id.researcher, relation: 'wasAssociatedWith' },
      { from: id.simulation2, to: id.grant, relation: 'used' },
      { from: id.simulation2, to: id.solver, relation: 'wasAssociatedWith' },
      { from: id.simulation2, to: id.researcher, relation: 'wasAssociatedWith' },
      { from: id.grant, to: id.decision, relation: 'wasGeneratedBy' },
      { from: id.decision, to: id.campaign, relation: 'used' },
      { from: id.decision, to: id.chair, relation: 'wasAssociatedWith' },
      { from: id.decision, to: id.committee, relation: 'wasAssociatedWith' },
    ]);
  });

  it('walks only towards origins: a run’s lineage has no archive and not the other run', () => {
    const run = lineageGraph(exampleRecords, id.run1);
    expect(run.nodes.map((n) => n.id)).toEqual([id.run1, id.simulation1, id.grant, id.solver, id.researcher, id.decision, id.campaign, id.chair, id.committee]);
    expect(run.nodes.some((n) => n.id === id.archive || n.id === id.run2)).toBe(false);
  });

  it('gives the grant the decision behind it, and an agent only itself', () => {
    expect(lineageGraph(exampleRecords, id.grant).nodes.map((n) => n.id)).toEqual([id.grant, id.decision, id.campaign, id.chair, id.committee]);
    expect(lineageGraph(exampleRecords, id.researcher)).toEqual({ nodes: [{ id: id.researcher, label: 'Mateo Lindqvist', type: 'agent', subtype: 'person' }], edges: [] });
  });

  it('is empty for an id no record names', () => {
    expect(lineageGraph(exampleRecords, 'localis:archive/unknown')).toEqual({ nodes: [], edges: [] });
    expect(lineageGraph([], id.archive)).toEqual({ nodes: [], edges: [] });
  });

  it('uses the latest label, the id for undeclared nodes, and the place a node was reached for its type', () => {
    const record: ProvenanceRecord = {
      v: 1,
      kind: 'analysis-computed',
      campaignId: EXAMPLE_CAMPAIGN_ID,
      at: '2026-12-02T00:00:00.000Z',
      entities: [{ id: id.archive, label: 'renamed archive', attributes: {} }],
      activities: [],
      agents: [],
      used: [],
      wasGeneratedBy: [],
      wasAssociatedWith: [],
      // Named only here: no record declares it.
      wasDerivedFrom: [{ generated: id.archive, used: 'localis:dataset/external' }],
    };
    const g = lineageGraph([...exampleRecords, record], id.archive);
    expect(g.nodes[0].label).toBe('renamed archive');
    expect(g.nodes.find((n) => n.id === 'localis:dataset/external')).toEqual({ id: 'localis:dataset/external', label: 'localis:dataset/external', type: 'entity', subtype: 'dataset' });
    expect(lineageGraph([record], 'localis:dataset/external').nodes).toEqual([{ id: 'localis:dataset/external', label: 'localis:dataset/external', type: 'entity', subtype: 'dataset' }]);
  });

  it('reads the subtype from the id', () => {
    expect(subtypeOf('localis:code/transfer-matrix@2.1.0')).toBe('code');
    expect(subtypeOf('localis:grant-decision/x')).toBe('grant-decision');
    expect(subtypeOf('urn:uuid:x')).toBe('other');
  });
});

describe('layerNodes', () => {
  it('lays the worked example out left to right, every arrow pointing right', () => {
    const layout = layerNodes(lineageGraph(exampleRecords, id.archive));
    const at = Object.fromEntries(layout.nodes.map((n) => [n.id, [n.column, n.row]]));
    expect(at).toEqual({
      [id.archive]: [0, 0],
      [id.run1]: [1, 0],
      [id.run2]: [1, 1],
      [id.upload]: [1, 2],
      [id.simulation1]: [2, 0],
      [id.simulation2]: [2, 1],
      [id.verifier]: [2, 2],
      [id.grant]: [3, 0],
      [id.solver]: [3, 1],
      // Associated with the upload and both simulations: right of all three.
      [id.researcher]: [3, 2],
      [id.decision]: [4, 0],
      [id.campaign]: [5, 0],
      [id.chair]: [5, 1],
      [id.committee]: [5, 2],
    });
    expect(layout.columns).toBe(6);
    expect(layout.rows).toBe(3);
    const column = new Map(layout.nodes.map((n) => [n.id, n.column]));
    for (const e of layout.edges) expect(column.get(e.to)!).toBeGreaterThan(column.get(e.from)!);
    // Each (column, row) holds one node.
    expect(new Set(layout.nodes.map((n) => `${n.column},${n.row}`)).size).toBe(layout.nodes.length);
  });

  it('handles an empty graph and survives a cycle a bad log might hold', () => {
    expect(layerNodes({ nodes: [], edges: [] })).toEqual({ nodes: [], edges: [], columns: 0, rows: 0 });
    const node = (n: string) => ({ id: `localis:run/${n}`, label: n, type: 'entity' as const, subtype: 'run' });
    const cyclic: LineageGraph = {
      nodes: [node('a'), node('b'), node('c')],
      edges: [
        { from: 'localis:run/a', to: 'localis:run/b', relation: 'wasDerivedFrom' },
        { from: 'localis:run/b', to: 'localis:run/c', relation: 'wasDerivedFrom' },
        { from: 'localis:run/c', to: 'localis:run/a', relation: 'wasDerivedFrom' },
      ],
    };
    const layout = layerNodes(cyclic);
    expect(layout.nodes.map((n) => [n.column, n.row])).toEqual([
      [0, 0],
      [1, 0],
      [2, 0],
    ]);
  });
});
