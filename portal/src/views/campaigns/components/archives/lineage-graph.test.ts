import { layerNodes, lineageGraph } from '@localis/shared';
import { afterEach, describe, expect, it } from 'vitest';
import { defineComponent, h } from 'vue';
import { mountInApp, resetTestPage } from '../../../../test/mount-in-app';
import { lineageRecords, provIds } from '../../test/provenance-fixture';
import LineageGraph from './lineage-graph.vue';

async function mountGraph() {
  const layout = layerNodes(lineageGraph(lineageRecords, provIds.archive));
  const host = await mountInApp(defineComponent({ render: () => h(LineageGraph, { layout, focusId: provIds.archive, title: 'Lineage of wc-sweep-L8-16.tar.gz' }) }));
  return host.getComponent(LineageGraph);
}

describe('LineageGraph', () => {
  afterEach(resetTestPage);

  describe('the drawing', () => {
    it('should draw a box per node, marked by type, with the archive in focus', async () => {
      const wrapper = await mountGraph();
      const boxes = wrapper.findAll('g.node');
      expect(boxes).toHaveLength(10);
      expect(boxes[0].classes()).toEqual(expect.arrayContaining(['entity', 'focus']));
      expect(boxes[0].text()).toContain('wc-sweep-L8-16.tar.gz');
      expect(boxes[0].text()).toContain('entity · archive');
      expect(wrapper.findAll('g.node.agent').map((b) => b.find('title').text())).toContain('Agent (person): Ilse Marrow');
    });

    it('should label each arrow with its relation and point it with a marker', async () => {
      const wrapper = await mountGraph();
      const edges = wrapper.findAll('g.edge');
      expect(edges).toHaveLength(13);
      expect(new Set(edges.map((e) => e.find('text').text()))).toEqual(new Set(['derived from', 'made by', 'used', 'done by']));
      expect(edges.every((e) => e.find('path').attributes('marker-end') === 'url(#lineage-arrow)')).toBe(true);
    });

    it('should let a wide drawing shrink a little to fit the page, and a phone scroll it instead', async () => {
      const wrapper = await mountGraph();
      const svg = wrapper.get('svg');
      expect(Number(svg.attributes('width'))).toBeGreaterThan(4 * 176);
      expect(svg.attributes('viewBox')).toBe(`0 0 ${svg.attributes('width')} ${svg.attributes('height')}`);
      expect(svg.attributes('style')).toContain(`min-width: ${Math.round(Number(svg.attributes('width')) * 0.85)}px`);
    });
  });

  describe('for those who do not see it', () => {
    it('should sum it up in its label and list every relation in words', async () => {
      const wrapper = await mountGraph();
      expect(wrapper.get('svg').attributes('role')).toBe('img');
      expect(wrapper.get('svg').attributes('aria-label')).toBe(
        'Lineage of wc-sweep-L8-16.tar.gz: 10 items and 13 relations, drawn from left to right. The list after the drawing says the same in words.',
      );
      const sentences = wrapper.findAll('[data-testid="lineage-sentences"] li').map((li) => li.text());
      expect(sentences).toHaveLength(13);
      expect(sentences).toContain('Transfer-matrix simulation L=12 was carried out by tmm-kernel 1.4.2.');
      expect(wrapper.text()).toContain('Entity: a file, run, grant or campaign');
    });
  });
});
