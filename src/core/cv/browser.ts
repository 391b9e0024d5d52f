/** Browser entry: the plain import works inside a module worker. Import this before loadCv(). */
import cv from '@techstark/opencv-js';
import { registerCv } from './index';

registerCv(cv);
