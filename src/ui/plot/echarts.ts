// The part of ECharts the renderer uses, registered once (keeps the bundle small).

import * as echarts from 'echarts/core';
import { LineChart, ScatterChart } from 'echarts/charts';
import { BrushComponent, GraphicComponent, GridComponent, LegendComponent } from 'echarts/components';
import { CanvasRenderer } from 'echarts/renderers';

echarts.use([ScatterChart, LineChart, GridComponent, LegendComponent, BrushComponent, GraphicComponent, CanvasRenderer]);

export { echarts };
