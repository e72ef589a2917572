import angularJson from '../../../angular.json';
import { APP_ICONS } from './app-icons';

describe('APP_ICONS', () => {
  it('are exactly the icons angular.json copies into the build', () => {
    const assets = angularJson.projects.emberline.architect.build.options.assets as (
      string | { glob: string; input: string; output?: string }
    )[];
    const icons = assets.find(
      (a) => typeof a !== 'string' && a.input.endsWith('@material-symbols/svg-400/outlined'),
    ) as { glob: string; output: string };
    expect(icons.output).toBe('icons');
    const copied = /^\{(.+)\}\.svg$/.exec(icons.glob)![1].split(',').sort();
    expect(copied).toEqual([...APP_ICONS].sort());
  });
});
