// Types of eslint.config.js for the tests that read its rules (tests/lint/layering.test.ts).
import type { Linter } from "eslint";

export interface FeatureZone {
  target: string;
  from: string;
  except: string[];
  message: string;
}

/** The no-restricted-paths zones that keep each of these features to itself and the others' index.ts. */
export function featureZones(features: string[]): FeatureZone[];

declare const config: Linter.Config[];
export default config;
