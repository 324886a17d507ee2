/** A campaign file given to solve/design, or a spec given to campaign, is refused with the command that fits. */
import { describe, expect, it } from 'vitest';
import { cli } from '../../engine/cli/app.js';

describe('the command that fits the file', () => {
  it.each([['design'], ['solve']])('%s refuses a campaign file and names "wellsmith campaign"', async (command) => {
    const out = await cli([command, 'runs/campaign-telecom.yaml']);
    expect(out.code).toBe(2);
    expect(out.stderr).toMatch(/this is a campaign file .*run it with "wellsmith campaign runs\/campaign-telecom.yaml"/);
  });

  it('campaign refuses a spec and names "wellsmith design"', async () => {
    const out = await cli(['campaign', 'runs/pump-976.yaml', '--out', '/tmp/ws-never-created']);
    expect(out.code).toBe(2);
    expect(out.stderr).toMatch(/this is a spec, not a campaign file; design it with "wellsmith design runs\/pump-976.yaml"/);
  });
});
