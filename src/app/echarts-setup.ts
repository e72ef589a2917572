// Loaded on demand by ngx-echarts (see app-config.ts): only the parts of ECharts we draw with.
import { LineChart } from 'echarts/charts';
import { GridComponent, LegendComponent, TooltipComponent } from 'echarts/components';
import { use } from 'echarts/core';
import { SVGRenderer } from 'echarts/renderers';

// SVG keeps a family of a few dozen line paths crisp at any zoom, and renders in jsdom specs.
use([LineChart, GridComponent, LegendComponent, TooltipComponent, SVGRenderer]);

export { init } from 'echarts/core';
