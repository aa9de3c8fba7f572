import marshmallow as ma


class HealthSchema(ma.Schema):
    status = ma.fields.String(required=True, metadata={"description": '"ok" when serving'})
    version = ma.fields.String(required=True, metadata={"description": "service version"})
    materials = ma.fields.Integer(
        required=True, metadata={"description": "number of built-in materials loaded"}
    )
    section_families = ma.fields.Integer(
        required=True, metadata={"description": "number of section families available"}
    )
