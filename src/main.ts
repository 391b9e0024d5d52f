/** Web app entry: mounts the Svelte app on #app. */
import { mount } from 'svelte';
import App from './ui/App.svelte';
import './ui/app.css';

const target = document.getElementById('app');
if (!target) throw new Error('Tessellab: the page has no #app element.');
mount(App, { target });
