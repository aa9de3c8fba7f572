"""Schemas of /v1/catalogs: section catalogues, built-in (data/catalogs) and the team's."""

from __future__ import annotations

import marshmallow as ma

from service.api.designs.schemas import CatalogMemberSchema
from service.core import materials as core_materials
from service.core.errors import InputError
from service.core.sections import FAMILIES


class CatalogSchema(ma.Schema):
    """A team catalogue: named members a design request may choose from by ``catalog: id``."""

    id = ma.fields.String(required=True, validate=ma.validate.Regexp(core_materials.ID_PATTERN),
                          metadata={"description": "slug, not a built-in catalogue's name"})
    name = ma.fields.String(load_default="", metadata={"description": "free text"})
    members = ma.fields.List(ma.fields.Nested(CatalogMemberSchema), required=True,
                             validate=ma.validate.Length(min=1))

    @ma.post_load
    def valid_members(self, data, **kwargs):
        """Each member's dimensions checked as its family checks them (errors at
        ``members.<k>.dimensions.<name>``)."""
        errors: dict[str, list[str]] = {}
        for k, member in enumerate(data["members"]):
            try:
                FAMILIES[member["family"]].validate(member["dimensions"])
            except InputError as error:
                for path, messages in error.errors.items():
                    errors[f"members.{k}.dimensions.{path}"] = messages
        if errors:
            raise ma.ValidationError(errors)
        return data


class CatalogMemberResponseSchema(ma.Schema):
    designation = ma.fields.String(required=True)
    family = ma.fields.String(required=True)
    dimensions = ma.fields.Dict(keys=ma.fields.String(), values=ma.fields.Float(),
                                required=True, metadata={"description": "metres"})
    material_families = ma.fields.List(ma.fields.String(), metadata={
        "description": "the material families it is made in (empty: any material)"})


class CatalogResponseSchema(ma.Schema):
    id = ma.fields.String(required=True)
    name = ma.fields.String(required=True)
    builtin = ma.fields.Boolean(required=True)
    members = ma.fields.List(ma.fields.Nested(CatalogMemberResponseSchema), required=True)


class CatalogListSchema(ma.Schema):
    count = ma.fields.Integer(required=True)
    catalogs = ma.fields.List(ma.fields.Nested(CatalogResponseSchema), required=True)
