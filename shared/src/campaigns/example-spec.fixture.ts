import { CampaignSpec, type CampaignSpecInput } from './campaign-spec.schema';
import { EXAMPLE_CAMPAIGN_SPEC } from './example-spec';

/**
 * The worked example (`EXAMPLE_CAMPAIGN_SPEC`) for the tests. Overrides replace top-level fields;
 * the result goes through the schema, so a test always holds what the server would hold.
 */
export function exampleSpec(overrides: Partial<CampaignSpecInput> = {}): CampaignSpec {
  return CampaignSpec.parse({ ...EXAMPLE_CAMPAIGN_SPEC, ...overrides });
}
