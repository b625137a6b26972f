"""The container files say what the tests run (no image can be built on the test machines).

The image's command is ``heatlift serve``, the command tests/conftest.py starts for every API
test; the probes of the Kubernetes manifest are the paths that stay open when API keys are set;
every HEATLIFT_ variable the files set is one the configuration table documents; and the
sizing rule holds: as many workers as requested CPUs.
"""

from __future__ import annotations

import json
import re
from pathlib import Path

import yaml

from api import settings
from api.auth import OPEN_PATHS

DOCKER = Path(__file__).resolve().parents[2] / "docker"
DOCUMENTED = set(re.findall(r"^\| (HEATLIFT_[A-Z_]+) \|", settings.__doc__ or "", re.MULTILINE))


def manifest() -> dict[str, dict]:
    return {d["kind"]: d for d in yaml.safe_load_all((DOCKER / "kubernetes.yaml").read_text())}


def test_the_image_runs_the_command_the_tests_start():
    text = (DOCKER / "Dockerfile").read_text()
    cmd = json.loads(re.search(r"^CMD (\[.*\])$", text, re.MULTILINE).group(1))
    assert cmd[:2] == ["heatlift", "serve"]
    conftest = (Path(__file__).resolve().parents[1] / "conftest.py").read_text()
    assert '"heatlift.cli", "serve"' in conftest
    assert re.search(r"^USER (?!root)\w+", text, re.MULTILINE), "the image runs as root"
    assert "/v1/ready" in re.search(r"^HEALTHCHECK[^\n]*\n[^\n]*", text, re.MULTILINE).group(0)


def test_probes_use_the_open_paths():
    container = manifest()["Deployment"]["spec"]["template"]["spec"]["containers"][0]
    assert container["readinessProbe"]["httpGet"]["path"] == "/v1/ready"
    assert container["livenessProbe"]["httpGet"]["path"] == "/v1/health"
    assert {"/v1/ready", "/v1/health"} <= OPEN_PATHS


def test_every_variable_the_files_set_is_documented():
    assert len(DOCUMENTED) >= 15
    container = manifest()["Deployment"]["spec"]["template"]["spec"]["containers"][0]
    compose = yaml.safe_load((DOCKER / "compose.yaml").read_text())
    names = {e["name"] for e in container["env"]}
    names |= set(compose["services"]["heatlift"]["environment"])
    names |= set(re.findall(r"\b(HEATLIFT_[A-Z_]+)=", (DOCKER / "Dockerfile").read_text()))
    assert names <= DOCUMENTED, names - DOCUMENTED


def test_sizing_rule_one_worker_per_requested_cpu():
    kinds = manifest()
    container = kinds["Deployment"]["spec"]["template"]["spec"]["containers"][0]
    workers = int({e["name"]: e.get("value") for e in container["env"]}["HEATLIFT_WORKERS"])
    assert float(container["resources"]["requests"]["cpu"]) == workers
    hpa = kinds["HorizontalPodAutoscaler"]["spec"]
    assert hpa["scaleTargetRef"]["name"] == kinds["Deployment"]["metadata"]["name"]
    assert hpa["metrics"][0]["resource"]["name"] == "cpu"
    grace = kinds["Deployment"]["spec"]["template"]["spec"]["terminationGracePeriodSeconds"]
    assert grace > 20  # gunicorn's graceful timeout (HEATLIFT_GRACEFUL_TIMEOUT)
