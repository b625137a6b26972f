"""POST /v1/charge over real HTTP."""

import copy

import pytest

from tests.api.problem import assert_problem

NORDKYL = {  # the demo scenario (Nordkyl Cold Stores is an invented company)
    "refrigerant": "R454B",
    "evaporating": -6,
    "condensing": 40,
    "superheat": 5,
    "subcooling": 3,
    "cooling_capacity": "18 kW",
    "lines": [
        {"line": "suction", "length": 25, "size": "1-3/8", "standard": "ASTM B280"},
        {"line": "discharge", "length": 12, "size": "7/8", "standard": "ASTM B280"},
        {"line": "liquid", "length": 20, "size": "5/8", "standard": "ASTM B280"},
    ],
    "heat_exchangers": [
        {"role": "evaporator", "internal_volume": 9, "model": "rouhani_axelsson",
         "tube_inside_diameter": 9.2, "circuits": 8},
        {"role": "condenser", "internal_volume": 6, "model": "rouhani_axelsson",
         "tube_inside_diameter": 7.2, "circuits": 6},
    ],
    "receivers": [{"volume": 10, "fill_fraction": 0.2}],
    "gwp_basis": "AR6",
    "space": {"floor_area": 120, "room_height": 4, "installation_height": "ceiling"},
}

PROPANE_IN_A_SMALL_ROOM = {
    "refrigerant": "R290",
    "evaporating": {"temperature": 0},
    "condensing": {"temperature": 45},
    "cooling_capacity": 7,
    "lines": [{"line": "liquid", "length": 8, "inside_diameter": 7.9},
              {"line": "suction", "length": 8, "inside_diameter": 13.8}],
    "heat_exchangers": [{"role": "evaporator", "internal_volume": 2.5},
                        {"role": "condenser", "internal_volume": 2.0}],
    "space": {"floor_area": 12, "room_height": 2.5, "installation_height": "floor"},
}


def value(node):
    return node["value"]


def test_nordkyl_system(http):
    r = http.post("/v1/charge", NORDKYL)
    assert r.status_code == 200, r.text
    body = r.json()
    parts = body["components"]
    total = value(body["total_charge"])
    assert body["total_charge"]["unit"] == "kg"
    assert total == pytest.approx(sum(value(p["mass"]) for p in parts), rel=1e-9)
    assert sum(value(p["share"]) for p in parts) == pytest.approx(1.0)
    # a 18 kW split system with 20 m of 5/8 liquid line holds some kilograms, most of it liquid
    # (common practice, no source)
    assert 4.0 < total < 15.0
    liquid = next(p for p in parts if p["role"] == "liquid")
    assert liquid["inside_diameter"] == {"value": pytest.approx(13.843, rel=1e-4), "unit": "mm"}
    assert liquid["mass"]["value"] > next(p for p in parts if p["role"] == "suction")[
        "mass"]["value"]
    condenser = next(p for p in parts if p["role"] == "condenser")
    assert [z["name"] for z in condenser["zones"]] == ["desuperheating", "two_phase",
                                                       "subcooled"]
    assert body["co2_equivalent"]["unit"] == "t"
    assert value(body["co2_equivalent"]) == pytest.approx(total * value(body["gwp"]) / 1000)
    limit = body["charge_limit"]
    assert limit["within_limit"] is True and "m_max" in limit["basis"]
    assert value(limit["installation_height"]) == pytest.approx(2.2)
    assert value(limit["room_volume"]) == pytest.approx(480.0) and \
        limit["room_volume"]["unit"] == "m^3"
    assert "licensed practitioner" in body["caution"]
    assert "ignition" in body["caution"] and "regulation" in body["caution"]
    assert body["operating_point"]["mass_flow_known"] is True


def test_cycle_request_gives_the_same_charge(http):
    inline = http.post("/v1/charge", NORDKYL).json()
    request = {k: v for k, v in NORDKYL.items()
               if k not in ("refrigerant", "evaporating", "condensing", "superheat",
                            "subcooling", "cooling_capacity")}
    request["cycle"] = {"refrigerant": "R454B", "evaporating": {"temperature": -6},
                        "condensing": {"temperature": 40}, "superheat": 5, "subcooling": 3,
                        "cooling_capacity": 18}
    r = http.post("/v1/charge", request)
    assert r.status_code == 200, r.text
    assert value(r.json()["total_charge"]) == pytest.approx(value(inline["total_charge"]),
                                                            rel=1e-9)


def test_ip_units(http):
    si = http.post("/v1/charge", NORDKYL).json()
    ip_request = copy.deepcopy(NORDKYL)
    ip_request.update(units="IP", evaporating="21.2 degF", condensing=104, superheat=9,
                      subcooling="5.4 delta_degF", cooling_capacity="18 kW")
    # bare numbers are IP now: give the metric figures with their units
    for line in ip_request["lines"]:
        line["length"] = f"{line['length']} m"
    for hx, d in zip(ip_request["heat_exchangers"], ("9.2 mm", "7.2 mm"), strict=True):
        hx["internal_volume"] = f"{hx['internal_volume']} L"
        hx["tube_inside_diameter"] = d
    ip_request["receivers"][0]["volume"] = "10 L"
    ip_request["space"] = {"floor_area": "120 m^2", "room_height": "4 m",
                           "installation_height": "2.2 m"}
    r = http.post("/v1/charge", ip_request)
    assert r.status_code == 200, r.text
    ip = r.json()
    assert ip["total_charge"]["unit"] == "lb"
    assert value(ip["total_charge"]) * 0.45359237 == pytest.approx(value(si["total_charge"]),
                                                                  rel=1e-6)


def test_room_too_small_for_propane(http):
    r = http.post("/v1/charge", PROPANE_IN_A_SMALL_ROOM)
    assert r.status_code == 200, r.text
    body = r.json()
    limit = body["charge_limit"]
    assert limit["within_limit"] is False
    assert value(limit["allowed_charge"]) < value(body["total_charge"])
    assert body["safety_class"] == "A3"
    assert "licensed practitioner" in body["caution"] and "ignition" in body["caution"]
    codes = [w["code"] for w in body["meta"]["warnings"]]
    assert "above_charge_limit" in codes
    message = next(w["message"] for w in body["meta"]["warnings"]
                   if w["code"] == "above_charge_limit")
    assert "kg" in message
    assert body["leak_checks"]["fluorinated"] is False


@pytest.mark.parametrize("path, where", [
    (("heat_exchangers", 0, "internal_volume"), "heat_exchangers.0.internal_volume"),
    (("receivers", 0, "volume"), "receivers.0.volume"),
    (("space", "room_height"), "space.room_height"),
])
def test_missing_volumes_are_422(http, path, where):
    request = copy.deepcopy(NORDKYL)
    node = request
    for key in path[:-1]:
        node = node[key]
    del node[path[-1]]
    body = assert_problem(http.post("/v1/charge", request), 422)
    assert where in body["errors"], body


def test_no_parts_is_422(http):
    request = {k: v for k, v in NORDKYL.items()
               if k not in ("lines", "heat_exchangers", "receivers")}
    assert_problem(http.post("/v1/charge", request), 422)


def test_drift_flux_model_without_tube_diameter_is_422(http):
    request = copy.deepcopy(NORDKYL)
    del request["heat_exchangers"][0]["tube_inside_diameter"]
    body = assert_problem(http.post("/v1/charge", request), 422)
    assert "heat_exchangers.0.tube_inside_diameter" in body["errors"]
    assert "zivi" in body["detail"]


def test_flammable_without_installation_height_is_422(http):
    request = copy.deepcopy(NORDKYL)
    del request["space"]["installation_height"]
    body = assert_problem(http.post("/v1/charge", request), 422)
    assert "space.installation_height" in body["errors"]


def test_bad_inputs_are_problems_not_500(http):
    cases = [
        dict(NORDKYL, evaporating="cold"),
        dict(NORDKYL, lines=[{"line": "suction", "length": 5}]),
        dict(NORDKYL, lines=[{"line": "suction", "length": 5, "size": "9/7"}]),
        dict(NORDKYL, lines=[{"line": "suction", "length": 0, "inside_diameter": 10}]),
        dict(NORDKYL, heat_exchangers=[{"role": "gas_cooler", "internal_volume": 3}]),
        dict(NORDKYL, heat_exchangers=[{"role": "condenser", "internal_volume": 3,
                                        "zone_shares": {"two_phase": 0.5}}]),
        dict(NORDKYL, space={"floor_area": 10, "room_height": 2, "installation_height": 3}),
        dict(NORDKYL, receivers=[{"volume": 10, "fill_fraction": 1.5}]),
        dict(NORDKYL, gwp_basis="AR9"),
        dict(NORDKYL, cycle={"refrigerant": "R454B"}),
        {k: v for k, v in NORDKYL.items() if k != "condensing"},
    ]
    for request in cases:
        assert_problem(http.post("/v1/charge", request), 422)
    body = assert_problem(http.post("/v1/charge", dict(NORDKYL, refrigerant="R454X")), 404)
    assert "R454B" in body["detail"]


def test_csv_output(http):
    r = http.session.post(http.base + "/v1/charge", json=PROPANE_IN_A_SMALL_ROOM,
                          params={"format": "csv"}, timeout=60)
    assert r.status_code == 200
    assert r.headers["Content-Type"].startswith("text/csv")
    assert "total_charge [kg]" in r.text.splitlines()[0]
