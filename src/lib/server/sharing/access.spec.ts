/** The access matrix for sharing, client pages, quotes, photos and the payment webhook. */
import { runAccessMatrix } from '../testing/access-matrix';
import { useApp } from '../testing/suite';
import { sharingRows } from '../testing/sharing-access-rows';

const app = useApp();

runAccessMatrix(sharingRows, app);
