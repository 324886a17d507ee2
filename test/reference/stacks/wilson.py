"""Fixture for the Wilson score interval of robust yields (engine/tolerance/robust.ts), from scipy's
own implementation (scipy.stats.binomtest(...).proportion_ci(method='wilson')), not from the
closed form the product uses. Run: python3 wilson.py > wilson.json
"""
import json
from scipy.stats import binomtest

cases = []
for k, n in [(8, 10), (0, 20), (20, 20), (150, 200), (1, 200), (97, 100), (500, 1000)]:
    ci = binomtest(k, n).proportion_ci(confidence_level=0.95, method='wilson')
    cases.append({'k': k, 'n': n, 'low': ci.low, 'high': ci.high})
print(json.dumps({'confidence': 0.95, 'cases': cases}, indent=2))
