export { anonymous, apiSignIn, DEMO, type ApiClient } from '../../scripts/lib/api-client';
