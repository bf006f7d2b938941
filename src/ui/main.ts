// Renderer entry: connects to the back end (desktop bridge or local server) and mounts the app.

import { createApp } from 'vue';
import App from './App.vue';
import StartFailure from './components/StartFailure.vue';
import { connect } from './transport';
import './styles.css';

const mountPoint = document.getElementById('app');
if (!mountPoint) throw new Error('index.html has no #app element');

try {
  const transport = connect();
  createApp(App, { transport }).mount(mountPoint);
} catch (error) {
  createApp(StartFailure, { message: error instanceof Error ? error.message : String(error) }).mount(mountPoint);
}
