import { CampaignSpec, EXAMPLE_CAMPAIGN_SPEC, estimateReport, type CampaignSpecInput } from '@localis/shared';
import { mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import { describe, expect, it } from 'vitest';
import { formatCoreHours } from '../../../lib/units';
import EstimatePanel from './estimate-panel.vue';

const reportOf = (overrides: Partial<CampaignSpecInput> = {}) => estimateReport(CampaignSpec.parse({ ...EXAMPLE_CAMPAIGN_SPEC, ...overrides }));

function mountPanel(props: InstanceType<typeof EstimatePanel>['$props']) {
  return mount(EstimatePanel, { props, global: { plugins: [[PrimeVue, { theme: 'none' }]] } });
}

describe('EstimatePanel', () => {
  describe('the total and the table', () => {
    it('should show the total in core-hours and one row per size when given a report', () => {
      const report = reportOf();
      const wrapper = mountPanel({ report });

      const total = wrapper.get('[data-testid="estimate-total"]');
      expect(total.text()).toBe(formatCoreHours(report.totalCoreHours));
      expect(total.text()).toMatch(/core-hours$/);

      const rows = wrapper.findAll('[data-testid="estimate-table"] tbody tr');
      expect(rows.map((r) => r.get('th').text())).toEqual(['6', '8', '12', '16']);
      const largest = wrapper.get('[data-testid="estimate-row-16"]');
      const last = report.rows[3];
      expect(largest.text()).toContain('13 × 1');
      expect(largest.text()).toContain(formatCoreHours(last.coreHours));
      expect(largest.text()).toContain('fits');
      expect(wrapper.get('[data-testid="estimate-table"] tfoot').text()).toContain('100 %');
    });

    it('should give the chart a label with every size when it is drawn', () => {
      const wrapper = mountPanel({ report: reportOf() });

      const label = wrapper.get('[data-testid="estimate-chart"]').attributes('aria-label');
      expect(label).toContain('L = 6:');
      expect(label).toContain('L = 16:');
    });
  });

  describe('memory', () => {
    it('should mark the sizes that do not fit the node when a job needs more than its memory', () => {
      const report = reportOf({ method: 'exact-diagonalization', targetPrecision: undefined, sizes: [8, 48], node: { coresPerNode: 64, memoryGiBPerNode: 16 } });
      const wrapper = mountPanel({ report });

      expect(wrapper.get('[data-testid="estimate-row-8"]').text()).toContain('fits');
      expect(wrapper.get('[data-testid="estimate-row-48"]').text()).toContain('does not fit');
      expect(wrapper.get('[data-testid="memory-meter"]').text()).toContain('Does not fit a node');
    });
  });

  describe('rate, assumptions and staleness', () => {
    it('should name the default rate and list the assumptions when there are no pilots', () => {
      const report = reportOf();
      const wrapper = mountPanel({ report });

      expect(wrapper.get('[data-testid="estimate-rate"]').text()).toContain('Default rate: 1.0 GFLOP/s');
      expect(wrapper.findAll('[data-testid="estimate-assumptions"] li')).toHaveLength(report.assumptions.length);
      expect(wrapper.find('[data-testid="estimate-stale"]').exists()).toBe(false);
    });

    it('should show the fitted power law when pilot timings set the rate', () => {
      const report = reportOf({
        pilotTimings: [
          { size: 6, seconds: 10, cores: 1 },
          { size: 12, seconds: 160, cores: 1 },
        ],
      });
      const wrapper = mountPanel({ report });

      const rate = wrapper.get('[data-testid="estimate-rate"]').text();
      expect(rate).toContain('Fitted to 2 pilot timings');
      expect(rate).toContain('4.00');
      expect(rate).toContain("the method's exponent is 7");
    });

    it('should say the numbers are the last valid plan\'s when the plan is stale', () => {
      const wrapper = mountPanel({ report: reportOf(), stale: true });

      expect(wrapper.get('[data-testid="estimate-stale"]').text()).toContain('last valid plan');
    });

    it('should give the share of the machine pool when the pool is known', () => {
      const report = reportOf();
      const wrapper = mountPanel({ report, pool: { machine: 'cluster-a', coreHours: Math.round(report.totalCoreHours * 4) } });

      expect(wrapper.get('[data-testid="estimate-pool-share"]').text()).toMatch(/^25 % of the cluster-a pool/);
    });
  });
});
